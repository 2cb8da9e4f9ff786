/**
 * Tokenises a CSV length report (csv-parse) into records with line numbers for core/lengths.
 * Quoting problems become errors naming file, line and column, like every other import error.
 */
import { parse } from 'csv-parse/sync';
import type { LengthRecord } from '../../../core/lengths/length-report.js';

const OPTIONS = { bom: true, comment: '#', relax_column_count: true, skip_empty_lines: true } as const;

/** A record of only empty cells (a line of commas) counts as a blank line. */
const isBlank = (cells: readonly string[]) => cells.every((cell) => cell.trim() === '');

/**
 * Line numbers without csv-parse's per-record info (which doubles the parse time): when every record
 * sits on one line, the records are the file's non-blank, non-comment lines in order. Returns null
 * when that does not hold provably (a quoted field spanning lines, escaped quotes...).
 */
function singleLineNumbers(text: string, records: readonly string[][]): number[] | null {
  const lines = text.split(/\r\n|\n|\r/);
  const numbers: number[] = [];
  lines.forEach((line, index) => {
    const trimmed = line.trim();
    if (trimmed === '' || trimmed.startsWith('#') || /^[,\s]*$/.test(trimmed)) return;
    numbers.push(index + 1);
  });
  if (numbers.length !== records.length) return null;
  for (let i = 0; i < records.length; i += 1) {
    const first = records[i][0] ?? '';
    if (!lines[numbers[i] - 1].includes(first)) return null;
  }
  return numbers;
}

export function tokeniseLengthCsv(file: string, text: string): { records: LengthRecord[]; errors: string[] } {
  try {
    const plain = (parse(text, OPTIONS) as string[][]).filter((cells) => !isBlank(cells));
    const numbers = singleLineNumbers(text, plain);
    if (numbers) return { records: plain.map((cells, i) => ({ line: numbers[i], cells })), errors: [] };
    // Some record spans lines: ask csv-parse where each one ends.
    const parsed = parse(text, { ...OPTIONS, info: true }) as unknown as { record: string[]; info: { lines: number } }[];
    const records = parsed.filter(({ record }) => !isBlank(record)).map(({ record, info }) => ({ line: info.lines, cells: record }));
    return { records, errors: [] };
  } catch (error) {
    const e = error as { code?: string; lines?: number; column?: number | string; message: string };
    const column = typeof e.column === 'number' ? ` column ${e.column + 1}` : '';
    return { records: [], errors: [`${file} line ${e.lines ?? '?'}${column}: ${e.message} (${e.code ?? 'CSV error'})`] };
  }
}

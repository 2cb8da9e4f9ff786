/**
 * Tokenises a CSV length report (csv-parse) into records with line numbers for core/lengths.
 * Quoting problems become errors naming file, line and column, like every other import error.
 */
import { parse } from 'csv-parse/sync';
import type { LengthRecord } from '../../../core/lengths/length-report.js';

export function tokeniseLengthCsv(file: string, text: string): { records: LengthRecord[]; errors: string[] } {
  try {
    const parsed = parse(text, {
      bom: true,
      comment: '#',
      info: true,
      relax_column_count: true,
      skip_empty_lines: true,
    }) as unknown as { record: string[]; info: { lines: number } }[];
    const records = parsed
      .map(({ record, info }) => ({ line: info.lines, cells: record }))
      .filter((r) => r.cells.some((cell) => cell.trim() !== '')); // rows of only commas are blank lines
    return { records, errors: [] };
  } catch (error) {
    const e = error as { code?: string; lines?: number; column?: number | string; message: string };
    const column = typeof e.column === 'number' ? ` column ${e.column + 1}` : '';
    return { records: [], errors: [`${file} line ${e.lines ?? '?'}${column}: ${e.message} (${e.code ?? 'CSV error'})`] };
  }
}

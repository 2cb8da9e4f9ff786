/**
 * Routed-length reports: a table with one row per net segment (columns net, layer, length and
 * optionally width), validated in full and compared with the project's nets. Pure: the caller
 * tokenises the CSV text and hands over records with their line numbers.
 *
 * Units: each value carries its unit ("1250mil", "31.75mm"), or the column header does
 * ("length_mil", "width (mm)"). A bare number with no unit anywhere is refused, never guessed.
 *
 * Mapping rule: rows are grouped by (net, layer) in file order; the Nth row of a net on a layer
 * updates the Nth `segment` element of that net on that layer, counting in the net's element order.
 * A row beyond the net's segments on that layer is "new" (listed, not written: placing a new segment
 * in the topology is an edit for people). Rows of nets the project does not hold are "unknown-net",
 * rows naming a layer that is not a copper layer of the stackup are "unknown-layer"; neither is
 * written, since a board-wide report lists many nets outside the buses under review.
 */
import { InputError } from '../errors.js';
import { parseQuantity, type QuantityLimits } from '../units/quantity.js';
import type { NetDefinition, Stackup } from '../project/model.js';

export interface ImportRow {
  net: string;
  layer: string;
  /** m */
  length: number;
  width: number | null;
  line: number;
  /** 'matched' | 'changed' | 'new' | 'unknown-layer' | 'unknown-net' */
  status: string;
  /** Previous length when changed, m. */
  previous: number | null;
  /** Index of the segment element the row maps to (matched/changed), else null. */
  elementIndex?: number | null;
  /** The segment in words, "segment 3 of DQ5 (2nd on L3_SIG)" (core/lengths/mapping-words.ts). */
  target?: string;
  /** Why the row writes nothing (core/lengths/mapping-words.ts). */
  reason?: string;
}

export interface ImportPreview {
  file: string;
  rows: ImportRow[];
  counts: Record<string, number>;
  /** Errors naming file, line, column and reason; an import with errors writes nothing. */
  errors: string[];
  /** True once applyImport wrote the changed lengths; false for a preview or a refused import. */
  applied?: boolean;
  /** The mapping rule in words (core/lengths/mapping-words.ts). */
  rule?: string;
  /** Rules the import applied that the reader should know of (e.g. how repeated rows were mapped). */
  notes?: string[];
}

/** One tokenised CSV record and the (1-based) line it starts on. */
export interface LengthRecord {
  line: number;
  cells: string[];
}

export interface LengthReportRow {
  net: string;
  layer: string;
  /** m */
  length: number;
  /** m, or null when the report gives none. */
  width: number | null;
  line: number;
}

export type LengthStatus = 'matched' | 'changed' | 'new' | 'unknown-layer' | 'unknown-net';
export const LENGTH_STATUSES: readonly LengthStatus[] = ['matched', 'changed', 'new', 'unknown-layer', 'unknown-net'];

/** A segment to rewrite when the import is applied. */
export interface SegmentTarget {
  net: string;
  elementIndex: number;
  length: number;
  width: number;
}

export interface LengthImportPlan {
  preview: ImportPreview;
  /** The changed segments, in file order; empty when the preview has errors. */
  updates: SegmentTarget[];
}

/**
 * Lengths above 1 m are unit mistakes rather than routing (common practice, no source). The lower
 * bound is the solver's own: a routed segment must be longer than zero (core/netbuild/build-circuit.ts),
 * so 0 mm, and 1e-400 mm that underflows to 0, are refused here rather than stored and refused later.
 */
const LENGTH_LIMITS: QuantityLimits = { min: 0, max: 1, minExclusive: true };
const WIDTH_LIMITS: QuantityLimits = { min: 0, max: 10e-3, minExclusive: true };
/**
 * Two lengths closer than 1 nm are the same: a report printed to 0.01 mil (254 nm) round-trips through
 * unit conversion with errors near 1e-16 m, far below this (common practice, no source).
 */
export const LENGTH_TOLERANCE = 1e-9;

type ColumnName = 'net' | 'layer' | 'length' | 'width';
const REQUIRED: ColumnName[] = ['net', 'layer', 'length'];
/** "length", "length_mil", "length mil", "length (mm)", "length[mm]". */
const HEADER = /^(net|layer|length|width)(?:\s*[[(]\s*([^\])]+?)\s*[\])]|(?:\s*_\s*|\s+)([^\s_]+))?$/i;

interface Column {
  index: number;
  /** Unit given by the header, e.g. "mil", or null. */
  unit: string | null;
  title: string;
}

function place(file: string, line: number, column?: Column): string {
  return column ? `${file} line ${line} column ${column.index + 1} (${column.title})` : `${file} line ${line}`;
}

/** Reads the header and checks every row; collects all errors rather than stopping at the first. */
export function readLengthReport(file: string, records: readonly LengthRecord[]): { rows: LengthReportRow[]; errors: string[] } {
  const errors: string[] = [];
  if (records.length === 0) return { rows: [], errors: [`${file}: the file is empty (expected a header with net, layer, length)`] };
  const header = records[0];
  const columns = new Map<ColumnName, Column>();
  header.cells.forEach((raw, index) => {
    const title = raw.trim();
    const match = HEADER.exec(title);
    if (!match) return; // other columns of a layout report are ignored
    const name = match[1].toLowerCase() as ColumnName;
    const unit = (match[2] ?? match[3] ?? null)?.trim().toLowerCase() ?? null;
    const where = `${file} line ${header.line} column ${index + 1} (${title})`;
    if (unit !== null && (name === 'net' || name === 'layer')) return; // e.g. "net_class": another column
    if (columns.has(name)) {
      errors.push(`${where}: the column "${name}" appears twice`);
      return;
    }
    if (unit !== null) {
      try {
        parseQuantity(`1${unit}`, 'length', where);
      } catch (error) {
        errors.push(error instanceof InputError ? error.message : String(error));
        return;
      }
    }
    columns.set(name, { index, unit, title });
  });
  const missing = REQUIRED.filter((name) => !columns.has(name));
  if (missing.length > 0) {
    errors.push(
      `${file} line ${header.line}: the header lacks the column${missing.length > 1 ? 's' : ''} ${missing.join(', ')} ` +
        `(found: ${header.cells.map((c) => c.trim()).join(', ') || 'nothing'})`,
    );
  }
  if (errors.length > 0) return { rows: [], errors };

  const net = columns.get('net')!;
  const layer = columns.get('layer')!;
  const length = columns.get('length')!;
  const width = columns.get('width');
  const rows: LengthReportRow[] = [];
  for (const record of records.slice(1)) {
    const { line, cells } = record;
    const cell = (c: Column) => (cells[c.index] ?? '').trim();
    const rowErrors: string[] = [];
    const need = Math.max(net.index, layer.index, length.index) + 1;
    if (cells.length < need) {
      errors.push(`${place(file, line)}: has ${cells.length} column${cells.length === 1 ? '' : 's'}, the header needs at least ${need}`);
      continue;
    }
    const netName = cell(net);
    const layerName = cell(layer);
    if (netName === '') rowErrors.push(`${place(file, line, net)}: the net name is empty`);
    if (layerName === '') rowErrors.push(`${place(file, line, layer)}: the layer name is empty`);
    const lengthValue = readLength(file, line, length, cell(length), LENGTH_LIMITS, rowErrors, false);
    const widthValue = width ? readLength(file, line, width, cell(width), WIDTH_LIMITS, rowErrors, true) : null;
    if (rowErrors.length > 0) {
      errors.push(...rowErrors);
      continue;
    }
    rows.push({ net: netName, layer: layerName, length: lengthValue as number, width: widthValue, line });
  }
  return { rows, errors };
}

const BARE_NUMBER = /^[-+]?(?:\d+\.?\d*|\.\d+)(?:e[-+]?\d+)?$/i;
const UNIT_OF = /^[-+]?(?:\d+\.?\d*|\.\d+)(?:e[-+]?\d+)?\s*(.+)$/i;

function readLength(
  file: string, line: number, column: Column, value: string, limits: QuantityLimits, errors: string[], optional: boolean,
): number | null {
  const where = () => place(file, line, column);
  if (value === '') {
    if (!optional) errors.push(`${where()}: the value is empty`);
    return null;
  }
  let text = value;
  if (BARE_NUMBER.test(value)) {
    if (column.unit === null) {
      errors.push(`${where()}: "${value}" has no unit; write it as e.g. ${value}mil or name the column ${column.title}_mil`);
      return null;
    }
    text = `${value}${column.unit}`;
  } else if (column.unit !== null) {
    const own = UNIT_OF.exec(value)?.[1].trim().toLowerCase();
    if (own !== undefined && own !== column.unit) {
      errors.push(`${where()}: "${value}" carries the unit ${own} but the column header says ${column.unit}`);
      return null;
    }
  }
  try {
    return parseQuantity(text, 'length', '', limits);
  } catch (error) {
    // parseQuantity names the field; the place text is built only for the (rare) bad value.
    if (error instanceof InputError) {
      errors.push(`${where()}: ${error.message.replace(/^: /, '')}`);
      return null;
    }
    throw error;
  }
}

/**
 * Compares report rows with the project (mapping rule in the module comment). Rows with errors never
 * reach here; when `errors` is non-empty the plan carries no updates.
 */
export function planLengthImport(
  file: string,
  rows: readonly LengthReportRow[],
  errors: readonly string[],
  project: { stackup: Stackup; nets: readonly NetDefinition[] },
  options: { allowRepeatedRows?: boolean } = {},
): LengthImportPlan {
  const repeats = repeatedRowProblems(file, rows, project);
  const notes = repeats.length > 0 && options.allowRepeatedRows ? [REPEAT_RULE] : [];
  if (!options.allowRepeatedRows) errors = [...errors, ...repeats];
  const copper = new Set(project.stackup.layers.filter((l) => l.kind === 'copper').map((l) => l.name));
  const nets = new Map(project.nets.map((n) => [n.name, n]));
  /** net -> layer -> element indices of the net's segments on that layer, in element order. */
  const segmentsOn = new Map<string, Map<string, number[]>>();
  /** net -> layer -> rows of the report seen so far. */
  const used = new Map<string, Map<string, number>>();
  for (const net of project.nets) {
    const byLayer = new Map<string, number[]>();
    net.elements.forEach((element, index) => {
      if (element.kind !== 'segment') return;
      const list = byLayer.get(element.layer);
      if (list) list.push(index);
      else byLayer.set(element.layer, [index]);
    });
    segmentsOn.set(net.name, byLayer);
    used.set(net.name, new Map());
  }

  const out: ImportRow[] = [];
  const updates: SegmentTarget[] = [];
  const counts: Record<string, number> = Object.fromEntries(LENGTH_STATUSES.map((s) => [s, 0]));
  for (const row of rows) {
    const net = nets.get(row.net);
    let status: LengthStatus;
    let previous: number | null = null;
    let elementIndex: number | null = null;
    if (!net) {
      status = 'unknown-net';
    } else if (!copper.has(row.layer)) {
      status = 'unknown-layer';
    } else {
      const seen = used.get(row.net)!;
      const ordinal = seen.get(row.layer) ?? 0;
      seen.set(row.layer, ordinal + 1);
      const index = segmentsOn.get(row.net)!.get(row.layer)?.[ordinal];
      if (index === undefined) {
        status = 'new';
      } else {
        const segment = net.elements[index] as Extract<NetDefinition['elements'][number], { kind: 'segment' }>;
        elementIndex = index;
        const lengthChanged = Math.abs(segment.length - row.length) > LENGTH_TOLERANCE;
        const widthChanged = row.width !== null && Math.abs(segment.width - row.width) > LENGTH_TOLERANCE;
        if (lengthChanged || widthChanged) {
          status = 'changed';
          previous = segment.length;
          updates.push({ net: row.net, elementIndex: index, length: row.length, width: row.width ?? segment.width });
        } else {
          status = 'matched';
        }
      }
    }
    counts[status] += 1;
    out.push({ net: row.net, layer: row.layer, length: row.length, width: row.width, line: row.line, status, previous, elementIndex });
  }
  return {
    preview: { file, rows: out, counts, errors: [...errors], applied: false, ...(notes.length > 0 ? { notes } : {}) },
    updates: errors.length > 0 ? [] : updates,
  };
}

const REPEAT_RULE =
  'Repeated rows: a row that repeats the net, layer and length of an earlier row is kept as its own segment ' +
  '(the Nth row of a net on a layer sets the Nth segment of that net on that layer).';

/**
 * A row repeating an earlier row's (net, layer, length) is most often a report exported twice, but the
 * mapping rule would silently write it onto the net's next segment. Refused unless confirmed; the
 * confirmation puts the rule in the preview's notes.
 */
function repeatedRowProblems(file: string, rows: readonly LengthReportRow[], project: { nets: readonly NetDefinition[] }): string[] {
  const known = new Set(project.nets.map((n) => n.name));
  const first = new Map<string, LengthReportRow[]>();
  const problems: string[] = [];
  for (const row of rows) {
    if (!known.has(row.net)) continue; // never written, so a repeat changes nothing
    const key = `${row.net}\u0000${row.layer}`;
    const earlier = first.get(key) ?? [];
    const twin = earlier.find((e) => Math.abs(e.length - row.length) <= LENGTH_TOLERANCE);
    if (twin) {
      problems.push(
        `${file} line ${row.line}: repeats line ${twin.line} (net ${row.net}, layer ${row.layer}, ${(row.length * 1e3).toFixed(3)} mm); ` +
          `by the mapping rule it would set segment ${earlier.length + 1} of ${row.net} on ${row.layer}. ` +
          'Remove the repeated row, or confirm that each row is its own segment (CLI: --allow-repeats)',
      );
    }
    earlier.push(row);
    first.set(key, earlier);
  }
  return problems;
}

/** One line for the change log and the CLI, e.g. "lengths.csv: 12 changed, 80 matched, 1 new". */
export function summariseImport(preview: ImportPreview): string {
  const parts = LENGTH_STATUSES.filter((s) => (preview.counts[s] ?? 0) > 0).map((s) => `${preview.counts[s]} ${s}`);
  const tail = preview.errors.length > 0 ? `, ${preview.errors.length} error${preview.errors.length === 1 ? '' : 's'}` : '';
  return `${preview.file}: ${parts.join(', ') || 'no rows'}${tail}`;
}

/**
 * The corner table as edited: text drafts per corner, parsed into Corner values with every problem
 * named by row and field ("corner 2 (typical) edge rate ×: …") before anything is sent. A field left
 * as it was shown keeps its stored value exactly, so saving an untouched row changes nothing.
 */
import type { Corner, ProjectData } from '../../../core/project/model.js';
import type { LengthUnit } from './format.js';
import { columnText, factorText, parseFactor, parseInColumn, type ColumnUnit } from './quantity-text.js';
import { messageOf } from './errors.js';

export type FactorKey = 'driverStrength' | 'edgeRate' | 'dk' | 'rail' | 'cin';
export type CornerField = 'name' | FactorKey | 'widthDelta' | 'tco';

/** Column label and what the number does, in words (shown in the header and used in messages). */
export const FACTOR_COLUMNS: { key: FactorKey; label: string; acts: string }[] = [
  { key: 'driverStrength', label: 'driver strength ×', acts: 'output resistance (above 1 = weaker)' },
  { key: 'edgeRate', label: 'edge rate ×', acts: 'rise and fall times (above 1 = slower)' },
  { key: 'dk', label: 'Dk ×', acts: 'dielectric Dk (above 1 = slower, lower Z0)' },
  { key: 'rail', label: 'rail ×', acts: 'supply rails, VTT and rail-referenced levels' },
  { key: 'cin', label: 'input C ×', acts: 'receiver input capacitance' },
];

export interface CornerDraft {
  /** Stable key for the table row (survives add/remove). */
  id: number;
  name: string;
  driverStrength: string;
  edgeRate: string;
  dk: string;
  rail: string;
  cin: string;
  widthDelta: string;
  tco: Corner['tco'];
  /** The stored corner this row was shown from, and the text it was shown as; null for a new row. */
  origin: { corner: Corner; shown: Record<FactorKey | 'widthDelta', string> } | null;
}

/** Width deltas are a few µm: µm beside metric lengths, mil beside imperial ones. */
export function widthUnit(lengthUnit: LengthUnit): ColumnUnit {
  return lengthUnit === 'mil' ? 'mil' : 'µm';
}

let nextId = 1;

function shownTexts(corner: Corner, unit: ColumnUnit): Record<FactorKey | 'widthDelta', string> {
  return {
    driverStrength: factorText(corner.driverStrength),
    edgeRate: factorText(corner.edgeRate),
    dk: factorText(corner.dk),
    rail: factorText(corner.rail),
    cin: factorText(corner.cin),
    widthDelta: columnText(corner.widthDelta, unit),
  };
}

export function draftOf(corner: Corner, unit: ColumnUnit): CornerDraft {
  const shown = shownTexts(corner, unit);
  return { id: nextId++, name: corner.name, ...shown, tco: corner.tco, origin: { corner, shown } };
}

/** A new row: typical factors, a name not yet used. */
export function newDraft(existing: readonly CornerDraft[], unit: ColumnUnit): CornerDraft {
  const taken = new Set(existing.map((d) => d.name.trim().toLowerCase()));
  let n = existing.length + 1;
  while (taken.has(`corner ${n}`)) n += 1;
  return {
    id: nextId++, name: `corner ${n}`,
    driverStrength: '1', edgeRate: '1', dk: '1', rail: '1', cin: '1', widthDelta: columnText(0, unit), tco: 'typ',
    origin: null,
  };
}

/** Re-renders width deltas in another unit; rows that do not parse keep their text (it names its unit). */
export function convertWidthUnit(drafts: CornerDraft[], from: ColumnUnit, to: ColumnUnit): CornerDraft[] {
  return drafts.map((d) => {
    const untouched = d.origin !== null && d.widthDelta === d.origin.shown.widthDelta;
    if (untouched && d.origin) {
      const shown = { ...d.origin.shown, widthDelta: columnText(d.origin.corner.widthDelta, to) };
      return { ...d, widthDelta: shown.widthDelta, origin: { ...d.origin, shown } };
    }
    try {
      return { ...d, widthDelta: columnText(parseInColumn(d.widthDelta, 'length', from, 'width delta'), to) };
    } catch {
      return d;
    }
  });
}

/** Row and field words used in every message about a row: `corner 2 (typical)`. */
export function rowWhere(index: number, draft: Pick<CornerDraft, 'name'>): string {
  const name = draft.name.trim();
  return `corner ${index + 1}${name ? ` (${name})` : ''}`;
}

/**
 * The narrowest trace width in the project (segments and layer defaults), m: a width delta at or
 * below minus this would give a trace of zero or negative width at that corner.
 */
export function narrowestTrace(data: Pick<ProjectData, 'nets' | 'stackup'>): { width: number; where: string } | null {
  let best: { width: number; where: string } | null = null;
  for (const layer of data.stackup.layers) {
    if (layer.defaultWidth !== undefined && (!best || layer.defaultWidth < best.width)) {
      best = { width: layer.defaultWidth, where: `default width of ${layer.name}` };
    }
  }
  for (const net of data.nets) {
    for (const e of net.elements) {
      if (e.kind === 'segment' && (!best || e.width < best.width)) best = { width: e.width, where: `a segment of ${net.name} on ${e.layer}` };
    }
  }
  return best;
}

export interface ParsedCorners {
  corners: Corner[] | null;
  /** `${rowId}.${field}` -> message naming row and field; `table` for the table as a whole. */
  errors: Record<string, string>;
}

/** Parses every row; `corners` is null while any field is refused. */
export function parseCorners(
  drafts: readonly CornerDraft[],
  unit: ColumnUnit,
  narrowest: { width: number; where: string } | null,
): ParsedCorners {
  const errors: Record<string, string> = {};
  const corners: Corner[] = [];
  if (drafts.length === 0) errors.table = 'at least one corner is needed: the budgets report the worst corner';
  drafts.forEach((d, i) => {
    const where = rowWhere(i, d);
    const keep = (field: FactorKey | 'widthDelta', parse: () => number): number => {
      if (d.origin && d[field] === d.origin.shown[field]) return d.origin.corner[field];
      try {
        return parse();
      } catch (e) {
        errors[`${d.id}.${field}`] = messageOf(e);
        return Number.NaN;
      }
    };
    const name = d.name.trim();
    if (!name) errors[`${d.id}.name`] = `${where} name: a name is needed`;
    const factors = Object.fromEntries(
      FACTOR_COLUMNS.map((c) => [c.key, keep(c.key, () => parseFactor(d[c.key], `${where} ${c.label}`))]),
    ) as Record<FactorKey, number>;
    const widthDelta = keep('widthDelta', () => parseInColumn(d.widthDelta, 'length', unit, `${where} width delta`));
    if (narrowest && Number.isFinite(widthDelta) && widthDelta <= -narrowest.width) {
      errors[`${d.id}.widthDelta`] = `${where} width delta: ${columnText(widthDelta, unit)} would leave no copper on the narrowest trace (${columnText(narrowest.width, unit)}, ${narrowest.where})`;
    }
    corners.push({ name, ...factors, widthDelta, tco: d.tco });
  });
  const seen = new Map<string, number>();
  drafts.forEach((d, i) => {
    const key = d.name.trim().toLowerCase();
    if (!key) return;
    const first = seen.get(key);
    if (first === undefined) seen.set(key, i);
    else errors[`${d.id}.name`] = `${rowWhere(i, d)} name: “${d.name.trim()}” is already the name of corner ${first + 1}`;
  });
  return { corners: Object.keys(errors).length ? null : corners, errors };
}

/** True when two corner sets are the same, field by field and in the same order. */
export function sameCorners(a: readonly Corner[], b: readonly Corner[]): boolean {
  const keys: (keyof Corner)[] = ['name', 'driverStrength', 'edgeRate', 'dk', 'widthDelta', 'rail', 'cin', 'tco'];
  return a.length === b.length && a.every((c, i) => keys.every((k) => Object.is(c[k], b[i][k])));
}

const SERVER_FIELDS: Record<string, CornerField> = {
  driverStrength: 'driverStrength', edgeRate: 'edgeRate', dk: 'dk', rail: 'rail', cin: 'cin', widthDelta: 'widthDelta',
};

/**
 * Where a refusal from the services belongs in the table. The services name places as
 * `corner NAME field`, `corner "NAME"` (a duplicate) or `corner NAME` (the Tco choice); anything else
 * belongs to the table as a whole.
 */
export function placeServerError(where: string | null, drafts: readonly CornerDraft[]): string {
  if (!where) return 'table';
  const quoted = /^corner "(.*)"$/.exec(where);
  if (quoted) {
    const row = drafts.find((d) => d.name.trim() === quoted[1]);
    if (row) return `${row.id}.name`;
    // No row of that name: a name that itself holds quotes, matched below.
  }
  // Longest name first: "slow" must not capture "slow hot".
  const byLength = [...drafts].sort((a, b) => b.name.trim().length - a.name.trim().length);
  for (const d of byLength) {
    const prefix = `corner ${d.name.trim()}`;
    if (where === prefix) return `${d.id}.tco`;
    if (where.startsWith(`${prefix} `)) {
      const field = SERVER_FIELDS[where.slice(prefix.length + 1)];
      return field ? `${d.id}.${field}` : `${d.id}.name`;
    }
  }
  return 'table';
}

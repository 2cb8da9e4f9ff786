/**
 * A bus's timing inputs as edited: the timing numbers of its budget model and its allowances, as
 * text in ps, parsed back into a BusDefinition with every problem named by field or allowance row
 * before anything is sent. Fields left as shown keep their stored values exactly.
 */
import type { BudgetAllowance, BusDefinition } from '../../../core/project/model.js';
import type { QuantityLimits } from '../../../core/units/quantity.js';
import { columnText, parseInColumn } from './quantity-text.js';
import { messageOf } from './errors.js';

export type TimingKey = 'cycleTime' | 'clockSkew' | 'jitter' | 'tValidBefore' | 'tValidAfter';

export interface TimingField {
  key: TimingKey;
  label: string;
  /** The term's name in the budget (BudgetItems shows the same name). */
  term: string;
  help: string;
  limits: QuantityLimits;
}

/** Timing fields per budget model (docs/design.md §6), with the limits the services also enforce. */
export const TIMING_FIELDS: Record<BusDefinition['kind'], TimingField[]> = {
  'common-clock': [
    { key: 'cycleTime', label: 'cycle time', term: 'Tcycle', help: 'clock period', limits: { min: 0, minExclusive: true } },
    { key: 'clockSkew', label: 'clock skew', term: 'clock skew', help: 'clock flight to the driver minus clock flight to the receiver (a later launch costs setup, adds to hold)', limits: {} },
    { key: 'jitter', label: 'jitter', term: 'jitter', help: 'cycle-to-cycle clock jitter, charged to setup', limits: { min: 0 } },
  ],
  'source-synchronous': [
    { key: 'tValidBefore', label: 'valid before', term: 'Tvalid,before', help: 'data valid before the strobe edge at the driver', limits: {} },
    { key: 'tValidAfter', label: 'valid after', term: 'Tvalid,after', help: 'data valid after the strobe edge at the driver', limits: {} },
  ],
};

/** The budget's formula as the engine sums it (docs/design.md §6), shown beside the inputs. */
export const FORMULAS: Record<BusDefinition['kind'], { setup: string; hold: string }> = {
  'common-clock': {
    setup: 'setup margin = Tcycle − (Tco,max + Tflight,max + Tsetup + clock skew + jitter + allowances)',
    hold: 'hold margin = Tco,min + Tflight,min − Thold + clock skew − allowances',
  },
  'source-synchronous': {
    setup: 'setup margin = Tvalid,before − Tsetup − (Tflight,data,max − Tflight,strobe,min) − allowances',
    hold: 'hold margin = Tvalid,after − Thold − (Tflight,strobe,max − Tflight,data,min) − allowances',
  },
};

export interface AllowanceDraft {
  id: number;
  name: string;
  value: string;
  appliesTo: BudgetAllowance['appliesTo'];
  note: string;
  origin: { allowance: BudgetAllowance; shownValue: string } | null;
}

export interface BusDraft {
  /** Timing text per field of the bus's kind. */
  timing: Partial<Record<TimingKey, string>>;
  shownTiming: Partial<Record<TimingKey, string>>;
  allowances: AllowanceDraft[];
}

let nextId = 1;

export function busDraftOf(bus: BusDefinition): BusDraft {
  const timing: Partial<Record<TimingKey, string>> = {};
  const values = bus.timing as unknown as Record<TimingKey, number>;
  for (const f of TIMING_FIELDS[bus.kind]) timing[f.key] = columnText(values[f.key], 'ps');
  return {
    timing,
    shownTiming: { ...timing },
    allowances: bus.allowances.map((a) => {
      const shownValue = columnText(a.value, 'ps');
      return { id: nextId++, name: a.name, value: shownValue, appliesTo: a.appliesTo, note: a.note, origin: { allowance: a, shownValue } };
    }),
  };
}

export function newAllowance(existing: readonly AllowanceDraft[]): AllowanceDraft {
  const taken = new Set(existing.map((a) => a.name.trim().toLowerCase()));
  let n = existing.length + 1;
  while (taken.has(`allowance ${n}`)) n += 1;
  return { id: nextId++, name: `allowance ${n}`, value: '0 ps', appliesTo: 'both', note: '', origin: null };
}

export function allowanceWhere(index: number, draft: Pick<AllowanceDraft, 'name'>): string {
  const name = draft.name.trim();
  return `allowance ${index + 1}${name ? ` (${name})` : ''}`;
}

export interface ParsedBus {
  bus: BusDefinition | null;
  /** `timing.KEY`, `${allowanceId}.FIELD`, or `form` for the bus as a whole. */
  errors: Record<string, string>;
}

export function parseBus(bus: BusDefinition, draft: BusDraft): ParsedBus {
  const errors: Record<string, string> = {};
  const timing: Record<string, number | string> = { kind: bus.kind };
  const stored = bus.timing as unknown as Record<TimingKey, number>;
  for (const f of TIMING_FIELDS[bus.kind]) {
    const text = draft.timing[f.key] ?? '';
    if (text === draft.shownTiming[f.key]) {
      timing[f.key] = stored[f.key];
      continue;
    }
    try {
      timing[f.key] = parseInColumn(text, 'time', 'ps', `bus ${bus.name} ${f.label} (${f.term})`, f.limits);
    } catch (e) {
      errors[`timing.${f.key}`] = messageOf(e);
    }
  }
  const allowances: BudgetAllowance[] = [];
  draft.allowances.forEach((a, i) => {
    const where = `bus ${bus.name} ${allowanceWhere(i, a)}`;
    const name = a.name.trim();
    if (!name) errors[`${a.id}.name`] = `${where} name: a name is needed`;
    let value = Number.NaN;
    if (a.origin && a.value === a.origin.shownValue) value = a.origin.allowance.value;
    else {
      try {
        value = parseInColumn(a.value, 'time', 'ps', `${where} value`);
      } catch (e) {
        errors[`${a.id}.value`] = messageOf(e);
      }
    }
    allowances.push({ name, value, appliesTo: a.appliesTo, note: a.origin && a.note.trim() === a.origin.allowance.note.trim() ? a.origin.allowance.note : a.note.trim() });
  });
  const seen = new Map<string, number>();
  draft.allowances.forEach((a, i) => {
    const key = a.name.trim().toLowerCase();
    if (!key) return;
    const first = seen.get(key);
    if (first === undefined) seen.set(key, i);
    else errors[`${a.id}.name`] = `bus ${bus.name} ${allowanceWhere(i, a)} name: “${a.name.trim()}” is already the name of allowance ${first + 1}`;
  });
  if (Object.keys(errors).length) return { bus: null, errors };
  return { bus: { ...bus, timing: timing as unknown as BusDefinition['timing'], allowances }, errors };
}

/** True when the edited bus has the same timing numbers and allowances as `b` (other fields are not edited here). */
export function sameTiming(a: BusDefinition, b: BusDefinition): boolean {
  if (a.kind !== b.kind || a.allowances.length !== b.allowances.length) return false;
  const ta = a.timing as unknown as Record<TimingKey, number>;
  const tb = b.timing as unknown as Record<TimingKey, number>;
  return TIMING_FIELDS[a.kind].every((f) => Object.is(ta[f.key], tb[f.key]))
    && a.allowances.every((x, i) => {
      const y = b.allowances[i];
      return x.name === y.name && Object.is(x.value, y.value) && x.appliesTo === y.appliesTo && x.note === y.note;
    });
}

const SERVER_TIMING: Record<string, TimingKey> = {
  'cycle time': 'cycleTime', 'clock skew': 'clockSkew', jitter: 'jitter',
  'valid-before time': 'tValidBefore', 'valid-after time': 'tValidAfter',
};

/**
 * Where a refusal from the services belongs in the form. The services name places as
 * `bus NAME cycle time`, `bus NAME allowance ANAME`, `bus NAME allowance "ANAME"` (a duplicate);
 * anything else belongs to the form as a whole.
 */
export function placeServerError(where: string | null, busName: string, draft: BusDraft): string {
  const prefix = `bus ${busName} `;
  if (!where || !where.startsWith(prefix)) return 'form';
  const rest = where.slice(prefix.length);
  const timing = SERVER_TIMING[rest];
  if (timing) return `timing.${timing}`;
  // A quoted name is a duplicate (name field); a bare name is a refused value. Names may hold an
  // inch mark (2" stub), so the quotes count only when they wrap the whole name of a row.
  const quoted = /^allowance "(.*)"$/.exec(rest);
  const duplicate = quoted && draft.allowances.find((a) => a.name.trim() === quoted[1]);
  if (duplicate) return `${duplicate.id}.name`;
  if (rest.startsWith('allowance ')) {
    const name = rest.slice('allowance '.length);
    const row = draft.allowances.find((a) => a.name.trim() === name);
    if (row) return `${row.id}.value`;
  }
  return 'form';
}

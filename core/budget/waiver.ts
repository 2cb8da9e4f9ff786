/**
 * Waivers against results (docs/workbench.md, "Waivers"): which check of a net a waiver covers, and
 * whether a waiver still matches the net's result. A waiver never changes a result or a status; these
 * functions only say what it stands for.
 */
import type { Waiver } from '../project/model.js';
import type { NetSummary, Status } from './results.js';

/** The check a waiver of the net would cover, as it is now. */
export interface WaivableCheck {
  /** "setup margin", "hold margin", "timing" (a receiver never crosses) or a signal check's name. */
  check: string;
  status: 'fail' | 'tight';
  /** s for timing checks, V for signal checks (room inside the limit: negative = past it); null when none. */
  margin: number | null;
  unit: 's' | 'V' | null;
}

/**
 * How much worse a waived margin may get and still count as the same (half the precision the report
 * and the table print: 0.05 ps, 0.5 mV), so that rounding alone never makes a waiver stale.
 */
export const WAIVER_TOLERANCE = { s: 0.05e-12, V: 0.5e-3 } as const;

const known = (x: number | null | undefined): x is number => typeof x === 'number' && Number.isFinite(x);

/** Room inside the limit of one signal check, V (negative when it fails); null for yes/no checks. */
function qualityRoom(q: NetSummary['quality'][number]): number | null {
  if (q.limit === null) return null;
  switch (q.name) {
    case 'overshoot': return q.limit - q.value;
    default: return q.value - q.limit; // undershoot, ringback (limit 0), differential level
  }
}

/**
 * The worst failing check of a net, else (a tight net) the check inside the guard band; null for a
 * passing net. Order (our rule, docs/workbench.md "Waivers"): a timing margin below zero (the smaller
 * of setup and hold), then a timed net without margins (a receiver never crosses), then the failing
 * signal check with the least room (a failed yes/no check counts as having none), then a tight margin.
 * A strobe or clock row's margins are its data nets' (marginsFrom): only its own signal checks count.
 */
export function waivableCheck(result: NetSummary): WaivableCheck | null {
  if (result.status === 'pass') return null;
  const own = !result.marginsFrom;
  const setup = own ? result.setupMargin : null;
  const hold = own ? result.holdMargin : null;
  const timing = (status: 'fail' | 'tight'): WaivableCheck | null => {
    if (known(setup) && known(hold)) return setup <= hold ? { check: 'setup margin', status, margin: setup, unit: 's' } : { check: 'hold margin', status, margin: hold, unit: 's' };
    if (known(setup)) return { check: 'setup margin', status, margin: setup, unit: 's' };
    if (known(hold)) return { check: 'hold margin', status, margin: hold, unit: 's' };
    return null;
  };
  if (result.status === 'fail') {
    const t = timing('fail');
    if (t && t.margin !== null && t.margin < 0) return t;
    if (own && !known(setup) && !known(hold) && result.corners.some((c) => c.flightMin === null || c.flightMax === null)) {
      return { check: 'timing', status: 'fail', margin: null, unit: null };
    }
    let worst: { name: string; room: number | null } | null = null;
    for (const q of result.quality) {
      if (q.pass) continue;
      const room = qualityRoom(q);
      if (!worst || (worst.room !== null && (room === null || room < worst.room))) worst = { name: q.name, room };
    }
    if (worst) return { check: worst.name, status: 'fail', margin: worst.room, unit: worst.room === null ? null : 'V' };
    return t ?? { check: 'status', status: 'fail', margin: null, unit: null };
  }
  return timing('tight') ?? { check: 'status', status: 'tight', margin: null, unit: null };
}

export interface WaiverState {
  /** current: the result still shows what was waived (or better); stale: it needs review. */
  state: 'current' | 'stale';
  /** Why it is stale, in words; empty when current. */
  why: string;
}

function marginText(margin: number | null, unit: 's' | 'V' | null): string {
  if (margin === null || unit === null) return 'no number';
  return unit === 's' ? `${(margin / 1e-12).toFixed(1)} ps` : `${(margin / 1e-3).toFixed(1)} mV`;
}

/**
 * Whether a waiver still matches the net's result: the same check, the same status, and a margin no
 * worse than when waived (within WAIVER_TOLERANCE). A different check, another status, a worse margin
 * or a net that now passes make it stale. Without a result it cannot be judged and counts as current.
 */
export function waiverState(waiver: Waiver, result: NetSummary | null | undefined): WaiverState {
  if (!result) return { state: 'current', why: '' };
  const now = waivableCheck(result);
  if (!now) return { state: 'stale', why: `the net passes now; the waiver (${waiver.status} ${waiver.check}) is no longer needed` };
  if (now.check !== waiver.check) return { state: 'stale', why: `waived ${waiver.check}, but now ${now.check} is the worst check (${now.status})` };
  if (now.status !== waiver.status) return { state: 'stale', why: `waived as ${waiver.status}, now ${now.status}` };
  if (waiver.margin !== null && now.margin !== null && waiver.unit === now.unit && now.unit !== null && now.margin < waiver.margin - WAIVER_TOLERANCE[now.unit]) {
    return { state: 'stale', why: `${now.check} got worse: ${marginText(waiver.margin, waiver.unit)} when waived, ${marginText(now.margin, now.unit)} now` };
  }
  return { state: 'current', why: '' };
}

/** "fail · waived", "tight · waived (stale)": a status with its waiver beside it, never instead of it. */
export function waivedStatusText(status: Status, state: WaiverState['state'] | null): string {
  if (state === null) return status;
  return `${status} · waived${state === 'stale' ? ' (stale)' : ''}`;
}

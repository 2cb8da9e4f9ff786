/**
 * Length window of a net (docs/design.md §6, the inverse problem): the range of one segment's length that
 * keeps setup and hold margins >= 0 and every signal-quality check passing, with everything else as
 * routed. The caller supplies `probe(length)` (a re-simulation at the cases that matter); this module
 * only searches.
 *
 * Search (docs/design.md §6.3, "Length window"): flight time is close to linear in length (Td = length /
 * vp), so each edge's first trial goes where the margins, extrapolated from their slopes, reach half the
 * margin tolerance: the slopes between the two nearest evaluated lengths, or, before a second length is
 * known, the slopes the caller states (`slopes`: the segment's delay per metre with the sign each margin
 * takes). A trial that passes with its smallest margin inside the accepted band [0, `marginTolerance`],
 * that margin having fallen from the last passing length, is the edge (the boundary lies beyond it by at
 * most the tolerance over the slope); one that passes above the band is stepped from again, and one that
 * fails brackets the edge. A bracket is refined by the Illinois variant of regula falsi (Dowell &
 * Jarratt, "A modified regula falsi method for computing the root of an equation", BIT 11, 1971) aimed
 * at half the margin tolerance (so one secant step usually lands inside the accepted band) while the
 * failure is a timing one, by bisection while it is a signal-quality one (a yes/no boundary). It stops
 * when the passing end's margin is within `marginTolerance` of zero (default 0.25 ps, well under the
 * 1 ps the window is reported to) or the bracket is narrower than `lengthTolerance` (default 25 um,
 * about 0.17 ps of delay at 7 ps/mm: the resolution of an edge set by a signal-quality check or by a
 * jump in the margin).
 */

export interface WindowProbe {
  setupMargin: number;
  holdMargin: number;
  qualityPass: boolean;
}

export interface WindowSearchOptions {
  lowFactor?: number;
  highFactor?: number;
  marginTolerance?: number;
  lengthTolerance?: number;
  /** Evaluation budget per edge. */
  maxEvaluations?: number;
  /**
   * Expected change of each margin per metre of added length (s/m), e.g. -Td/length for a data net's
   * setup margin: where the first trial of an edge goes before a second length is known.
   */
  slopes?: { setup: number; hold: number };
  /** Lengths already evaluated with this probe (not counted again), e.g. by an earlier search. */
  known?: readonly WindowPoint[];
}

/** One evaluated length. */
export interface WindowPoint {
  x: number;
  p: WindowProbe;
}

export interface WindowSearchResult {
  /** m; null when no searched length passes. */
  min: number | null;
  max: number | null;
  /** True when the edge is the search limit (the window may extend beyond it). */
  minOpen: boolean;
  maxOpen: boolean;
  /** What bounds each edge: 'setup' | 'hold' | 'quality' | 'limit'. */
  minBound: EdgeBound;
  maxBound: EdgeBound;
  evaluations: number;
  note: string;
  /** Every length evaluated (or given as known), for a later search on the same probe. */
  points: WindowPoint[];
}

export type EdgeBound = 'setup' | 'hold' | 'quality' | 'limit' | 'none';

const passes = (p: WindowProbe): boolean => p.qualityPass && p.setupMargin >= 0 && p.holdMargin >= 0;
const timingMargin = (p: WindowProbe): number => Math.min(p.setupMargin, p.holdMargin);
/** A passing length whose smallest margin is within the accepted band [0, tolerance]. */
const inBand = (p: WindowProbe, tolerance: number): boolean => passes(p) && timingMargin(p) <= tolerance;
const boundOf = (p: WindowProbe): EdgeBound =>
  !p.qualityPass ? 'quality' : p.setupMargin < p.holdMargin ? 'setup' : 'hold';

/** Finds the passing/failing boundary between a passing `inside` and a failing `outside` length. */
function refineEdge(
  probe: (length: number) => WindowProbe,
  inside: WindowPoint,
  outside: WindowPoint,
  marginTolerance: number,
  lengthTolerance: number,
  maxEvaluations: number,
  seen: WindowPoint[],
): { edge: number; bound: EdgeBound; evaluations: number } {
  let a = inside;
  let b = outside;
  // The secant runs on the margin that fails at the outer end (the other one may be the smaller at the
  // inner end: their minimum has a kink) and aims at half the tolerance, inside the accepted band
  // [0, marginTolerance]. Illinois weights halve an end that stayed twice in a row.
  const aim = marginTolerance / 2;
  let wa = 1;
  let wb = 1;
  let evaluations = 0;
  let kept = 0; // which end the last step kept: -1 = a moved, +1 = b moved
  while (evaluations < maxEvaluations) {
    const timingFail = b.p.qualityPass && timingMargin(b.p) < 0;
    if (timingFail && timingMargin(a.p) <= marginTolerance) break;
    if (Math.abs(b.x - a.x) < lengthTolerance) break;
    const key = b.p.setupMargin < b.p.holdMargin ? 'setupMargin' : 'holdMargin';
    const fa = (a.p[key] - aim) * wa;
    const fb = (b.p[key] - aim) * wb;
    let x: number;
    if (timingFail && fa > 0 && fb < 0) {
      x = a.x + ((b.x - a.x) * fa) / (fa - fb);
      const lo = Math.min(a.x, b.x);
      const hi = Math.max(a.x, b.x);
      const guard = (hi - lo) * 1e-3; // keep the step strictly inside the bracket
      x = Math.min(hi - guard, Math.max(lo + guard, x));
    } else {
      x = (a.x + b.x) / 2;
    }
    const p = probe(x);
    evaluations++;
    seen.push({ x, p });
    if (passes(p)) {
      a = { x, p };
      wa = 1;
      if (kept === -1) wb /= 2; // b stayed twice in a row: Illinois halving
      kept = -1;
    } else {
      b = { x, p };
      wb = 1;
      if (kept === 1) wa /= 2;
      kept = p.qualityPass ? 1 : 0;
    }
  }
  return { edge: a.x, bound: boundOf(b.p), evaluations };
}

/**
 * The window of one segment's length around `current` (m). `probe` re-simulates the net with that
 * length. Starting points: the current length if it passes; otherwise the nearest passing length of
 * a scan in the direction the failure points to (shorter for setup, longer for hold, both for quality).
 */
export function searchLengthWindow(
  probe: (length: number) => WindowProbe,
  current: number,
  options: WindowSearchOptions = {},
): WindowSearchResult {
  const lowFactor = options.lowFactor ?? 0.2;
  const highFactor = options.highFactor ?? 3;
  const marginTolerance = options.marginTolerance ?? 0.25e-12;
  const lengthTolerance = options.lengthTolerance ?? 25e-6;
  const maxEvaluations = options.maxEvaluations ?? 30;
  const lo = current * lowFactor;
  const hi = current * highFactor;
  const range = `${lowFactor}x to ${highFactor}x of the present length`;
  let evaluations = 0;
  // every evaluated length (slopes, brackets, and the next search on the same probe)
  const known: WindowPoint[] = [...(options.known ?? [])];
  const evaluate = (x: number): WindowPoint => {
    const given = known.find((k) => k.x === x);
    if (given) return given;
    const point = { x, p: probe(x) };
    evaluations++;
    known.push(point);
    return point;
  };
  const now = evaluate(current).p;
  let inside: WindowPoint = { x: current, p: now };
  let nearFail: WindowPoint | null = null;

  if (!passes(now)) {
    const down = [0.8, 0.6, 0.4, lowFactor].filter((f) => f < 1 && f >= lowFactor).map((f) => current * f);
    const up = [1.25, 1.6, 2, 2.5, highFactor].filter((f) => f > 1 && f <= highFactor).map((f) => current * f);
    const order = !now.qualityPass ? interleave(down, up) : now.setupMargin < now.holdMargin ? down : up;
    // the last failing length on each side, nearest to the passing one found
    let lastDown: WindowPoint = { x: current, p: now };
    let lastUp: WindowPoint = { x: current, p: now };
    let found = false;
    for (const x of order) {
      const point = evaluate(x);
      if (passes(point.p)) {
        inside = point;
        nearFail = x < current ? lastDown : lastUp;
        found = true;
        break;
      }
      if (x < current) lastDown = point;
      else lastUp = point;
    }
    if (!found) {
      return {
        min: null, max: null, minOpen: false, maxOpen: false, minBound: 'none', maxBound: 'none', evaluations,
        note: `no length from ${range} passes (${describeFail(now)} at the present length)`, points: known,
      };
    }
  }

  const edges = { min: lo, max: hi, minOpen: true, maxOpen: true, minBound: 'limit' as EdgeBound, maxBound: 'limit' as EdgeBound };
  for (const dir of ['min', 'max'] as const) {
    const limit = dir === 'min' ? lo : hi;
    const s = dir === 'min' ? -1 : 1;
    let outside: WindowPoint | null = null;
    let a = inside;
    if (nearFail && (dir === 'min') === (nearFail.x < inside.x)) {
      outside = nearFail;
    } else {
      // lengths already known on this side, nearest first: passing ones move `a` out, the first
      // failing one closes the bracket
      const side = known.filter((k) => s * (k.x - inside.x) > 0 && s * (limit - k.x) >= 0).sort((p, q) => s * (p.x - q.x));
      for (const k of side) {
        if (passes(k.p)) a = k;
        else { outside = k; break; }
      }
      let landed = false;
      for (let step = 0; step < 8 && outside === null && !landed && a.x !== limit; step++) {
        const other = nearestOther(known, a);
        const x = extrapolatedEdge(a, other, options.slopes ?? null, s, limit, current, marginTolerance / 2)
          // neither a second length nor stated slopes: a small step gives the slopes
          ?? clampTo(a.x + s * SLOPE_STEP * current, limit, s);
        const point = evaluate(x);
        if (!passes(point.p)) outside = point;
        else {
          landed = x !== limit && inBand(point.p, marginTolerance) && timingMargin(point.p) < timingMargin(a.p);
          a = point;
        }
      }
      if (landed) {
        edges[dir] = a.x;
        if (dir === 'min') { edges.minOpen = false; edges.minBound = boundOf(a.p); } else { edges.maxOpen = false; edges.maxBound = boundOf(a.p); }
        continue;
      }
      if (outside === null && a.x !== limit) {
        const point = evaluate(limit); // the steps ran out: settle the limit itself
        if (passes(point.p)) a = point;
        else outside = point;
      }
      if (outside === null) continue; // passes at the limit: the edge stays open at the limit
    }
    const r = refineEdge(probe, a, outside, marginTolerance, lengthTolerance, maxEvaluations, known);
    evaluations += r.evaluations;
    edges[dir] = r.edge;
    if (dir === 'min') { edges.minOpen = false; edges.minBound = r.bound; } else { edges.maxOpen = false; edges.maxBound = r.bound; }
  }
  const notes: string[] = [];
  if (edges.minOpen && edges.maxOpen) notes.push(`passes over the whole search range (${range})`);
  else if (edges.minOpen) notes.push(`open at the short end: still passes at ${lowFactor}x, the search limit`);
  else if (edges.maxOpen) notes.push(`open at the long end: still passes at ${highFactor}x, the search limit`);
  const boundText = (b: EdgeBound): string => (b === 'quality' ? 'a signal-quality check' : `${b} margin`);
  if (!edges.minOpen) notes.push(`shortest length set by ${boundText(edges.minBound)}`);
  if (!edges.maxOpen) notes.push(`longest length set by ${boundText(edges.maxBound)}`);
  return { ...edges, evaluations, note: notes.join('; '), points: known };
}

/** Relative length step used to measure the margins' slopes when no slopes are stated. */
const SLOPE_STEP = 0.05;

function clampTo(x: number, limit: number, s: number): number {
  return s > 0 ? Math.min(x, limit) : Math.max(x, limit);
}

/** The evaluated point nearest to `a` (other than `a`), or null. */
function nearestOther(known: readonly WindowPoint[], a: { x: number }): WindowPoint | null {
  let best: WindowPoint | null = null;
  for (const k of known) if (k.x !== a.x && (!best || Math.abs(k.x - a.x) < Math.abs(best.x - a.x))) best = k;
  return best;
}

/**
 * Where the first margin falls to `aim` (half the accepted band, so the trial there usually lands in it)
 * moving from `a` in direction `s`, extrapolated linearly (flight time is close to linear in length)
 * from the slopes between `a` and `other`, or from the stated `slopes` while there is no usable second
 * length. At least 0.1 % of the present length from `a`; the search limit when no margin falls; null
 * when there are no slopes at all.
 */
function extrapolatedEdge(
  a: WindowPoint,
  other: WindowPoint | null,
  stated: { setup: number; hold: number } | null,
  s: number,
  limit: number,
  current: number,
  aim: number,
): number | null {
  const measured = other !== null && other.p.qualityPass;
  if (!measured && !stated) return null;
  let nearest = Infinity;
  for (const key of ['setupMargin', 'holdMargin'] as const) {
    const slope = measured ? (a.p[key] - other.p[key]) / (a.x - other.x) : key === 'setupMargin' ? stated!.setup : stated!.hold;
    const fall = -s * slope; // margin lost per metre moved in direction s
    if (fall > 0) nearest = Math.min(nearest, (a.p[key] - aim) / fall);
  }
  if (!Number.isFinite(nearest)) return limit;
  return clampTo(a.x + s * Math.max(nearest, 1e-3 * current), limit, s);
}

function interleave(a: number[], b: number[]): number[] {
  const out: number[] = [];
  for (let i = 0; i < Math.max(a.length, b.length); i++) {
    if (i < a.length) out.push(a[i]);
    if (i < b.length) out.push(b[i]);
  }
  return out;
}

function describeFail(p: WindowProbe): string {
  if (!p.qualityPass) return 'a signal-quality check fails';
  return p.setupMargin < p.holdMargin ? 'setup fails' : 'hold fails';
}

/**
 * The length window of a net's longest routed segment (docs/design.md §6, the inverse problem), found
 * by re-simulating the net at trial lengths (core/engine/length-window.ts searches).
 *
 * Probes simulate only the cases that limit the net now (worst setup, worst hold, worst signal
 * quality). Each edge found is then accepted when a linear bound shows no other case can limit it,
 * else checked by simulating the other cases there; if one of them limits, the search is redone at
 * every case. A timed net's data edges are independent, so only the limiting edges are simulated; a
 * strobe's both edges enter every budget, so it keeps both.
 */
import type { NetDefinition, ProjectData } from '../project/model.js';
import type { LengthWindow } from '../budget/results.js';
import type { ReceiverEdgeMeasure } from '../budget/measures.js';
import { longestSegment, routedLine, type NetBuildChanges } from '../netbuild/index.js';
import { searchLengthWindow, type WindowProbe, type WindowSearchResult } from './length-window.js';
import { allCases, caseCorner, caseKey, casesCorners, limitingCases, type Cases } from './cases.js';
import { qualityPasses, type Evaluation, type Evaluator } from './net-evaluation.js';
import type { NetKind } from './net-lookup.js';
import { formatIn } from '../units/quantity.js';

/**
 * How far a case's margins may stray from the linear shift (delay per metre x length change) at a
 * window edge: reflections move the crossings by less than this on the nets searched (this program's
 * choice, the same allowance as before the shift was taken per case).
 */
const REFLECTION_SLACK = 5e-12;

/** Re-simulates the net with `changes` on the given cases (all cases when null). */
export type Simulate = (changes?: NetBuildChanges, cases?: Cases | null) => ReceiverEdgeMeasure[];

/**
 * True when a closed window edge found on a case subset holds on the other cases `b` too: they pass
 * there, with margins no smaller than the subset's `a` (within 0.1 ps), so none of them limits the edge.
 * Margins are minima over cases, so subset and complement combine exactly.
 */
function edgeHolds(a: WindowProbe, b: WindowProbe): boolean {
  return b.qualityPass && Math.min(b.setupMargin, b.holdMargin) >= Math.min(a.setupMargin, a.holdMargin) - 0.1e-12;
}

/**
 * `segmentIndex`: the element whose length is searched (a segment); default the net's longest, as the
 * margin table shows (a what-if sweep of another segment asks for that one, core/engine/sweep.ts).
 */
export function netLengthWindow(
  project: ProjectData, net: NetDefinition, kind: NetKind,
  measures: readonly ReceiverEdgeMeasure[], own: Evaluation, evaluate: Evaluator, simulate: Simulate,
  segmentIndex?: number,
): LengthWindow | null {
  const longest = longestSegment(net);
  const segment = segmentIndex === undefined || segmentIndex === longest?.elementIndex ? longest : segmentAt(net, segmentIndex);
  if (!segment || kind === 'quality-only') return null;
  const limiting = limitingCases(project, measures, own.budget, kind);
  const others = new Set(allCases(project).filter((k) => !limiting.has(k)));
  const probeAt = (cases: Cases) => {
    const seen = new Map<number, WindowProbe>();
    const corners = casesCorners(project, cases);
    // the present length is already simulated at every case: its probe is read from those measures
    const present = measures.filter((m) => cases.has(caseKey(m.corner, m.edge)));
    const e0 = evaluate(present, corners);
    seen.set(segment.length, { setupMargin: e0.setup, holdMargin: e0.hold, qualityPass: qualityPasses(present) });
    return (length: number): WindowProbe => {
      let p = seen.get(length);
      if (!p) {
        const ms = simulate({ length: { elementIndex: segment.elementIndex, length } }, cases);
        const e = evaluate(ms, corners);
        p = { setupMargin: e.setup, holdMargin: e.hold, qualityPass: qualityPasses(ms) };
        seen.set(length, p);
      }
      return p;
    };
  };
  const onSubset = probeAt(limiting);
  // Td = length / vp: a data net's setup margin falls and its hold margin grows by the segment's delay
  // per metre of added length, a strobe's the other way round (docs/design.md §6.3): where each edge's
  // first trial goes.
  const dpmOf = new Map(project.corners.map((c) => [c.name, routedLine(project.stackup, segment.layer, segment.width, segment.spacing, c).delayPerMetre]));
  const dpm = casesCorners(project, limiting).map((c) => dpmOf.get(c.name)!);
  const perMetre = dpm.reduce((a, b) => a + b, 0) / dpm.length;
  const setupSign = kind === 'strobe' ? 1 : -1; // hold moves the other way
  const slopes = { setup: setupSign * perMetre, hold: -setupSign * perMetre };
  let w = searchLengthWindow(onSubset, segment.length, { slopes });
  // Linear bound: stretching the segment by dL shifts each case's setup and hold margin by its corner's
  // delay per metre x dL (Td = length / vp), with the sign `slopes` gives. A case left out of the search
  // cannot limit an edge when its margins, so shifted from the present length and less 5 ps for
  // reflections, stay at or above the searched cases' margin simulated at that edge, with its signal
  // quality passing now. Only the cases the bound cannot rule out are simulated at the edge (a
  // strobe's by whole corners: both of its edges enter every budget); if one of them limits there, the
  // search is redone at every case.
  const at = (cases: Cases) => {
    const ms = measures.filter((m) => cases.has(caseKey(m.corner, m.edge)));
    return { ...evaluate(ms, casesCorners(project, cases)), quality: qualityPasses(ms) };
  };
  const units: Set<string>[] = [];
  for (const k of others) {
    const corner = caseCorner(k);
    const same = kind === 'strobe' ? units.find((u) => [...u][0].startsWith(`${corner}|`)) : undefined;
    if (same) same.add(k);
    else units.push(new Set([k]));
  }
  const unitAt = units.map((u) => ({ cases: u, now: at(u), perMetre: dpmOf.get(caseCorner([...u][0]))! }));
  const mayLimit = (edge: number, searchedThere: WindowProbe): Set<string> => {
    const dL = edge - segment.length;
    const floor = Math.min(searchedThere.setupMargin, searchedThere.holdMargin);
    const out = new Set<string>();
    for (const u of unitAt) {
      const setupThere = u.now.setup + setupSign * u.perMetre * dL - REFLECTION_SLACK;
      const holdThere = u.now.hold - setupSign * u.perMetre * dL - REFLECTION_SLACK;
      const ruledOut = u.now.quality && Math.min(setupThere, holdThere) >= floor;
      if (!ruledOut) for (const k of u.cases) out.add(k);
    }
    return out;
  };
  let searched = onSubset;
  let holds = true;
  for (const [edge, open] of [[w.min, w.minOpen], [w.max, w.maxOpen]] as const) {
    if (!holds || edge === null || open) continue;
    const there = onSubset(edge);
    const check = mayLimit(edge, there);
    if (check.size > 0) holds = edgeHolds(there, probeAt(check)(edge));
  }
  if (!holds) {
    searched = probeAt(new Set(allCases(project)));
    w = searchLengthWindow(searched, segment.length, { slopes });
  }
  // The window for margin >= the guard band (docs/design.md §6.3): the same search on margins less the
  // guard band, over the cases that set the window above (their probes are reused where lengths repeat).
  // The lengths the first search evaluated seed this one (a length between the two windows' edges
  // already brackets a guard edge).
  const guard = project.info.guardBand;
  const lessGuard = (p: WindowProbe): WindowProbe => ({ ...p, setupMargin: p.setupMargin - guard, holdMargin: p.holdMargin - guard });
  const g = guard > 0
    ? searchLengthWindow((length) => lessGuard(searched(length)), segment.length,
      { slopes, known: w.points.map((k) => ({ x: k.x, p: lessGuard(k.p) })) })
    : w;
  const which = segment.elementIndex === longest?.elementIndex ? "the net's longest" : 'the segment asked for';
  const where = `segment ${segment.elementIndex + 1} on ${segment.layer} (${which}), the rest of the net and bus as routed`;
  return {
    elementIndex: segment.elementIndex,
    layer: segment.layer,
    current: segment.length,
    min: w.min,
    max: w.max,
    guardMin: g.min,
    guardMax: g.max,
    guardBand: guard,
    note: `${where}: margins >= 0: ${w.note}; margins >= the ${formatIn(guard, 'ps', 0)} guard band: ` +
      (g.min === null || g.max === null ? 'none in the searched range' : `${formatIn(g.min, 'mm', 2)} to ${formatIn(g.max, 'mm', 2)}`),
  };
}

/** Element `index` of the net as a segment to search, or null when it is not a segment. */
function segmentAt(net: NetDefinition, index: number): ReturnType<typeof longestSegment> {
  const e = net.elements[index];
  if (!e || e.kind !== 'segment') return null;
  return e.spacing !== undefined
    ? { elementIndex: index, layer: e.layer, width: e.width, length: e.length, spacing: e.spacing }
    : { elementIndex: index, layer: e.layer, width: e.width, length: e.length };
}

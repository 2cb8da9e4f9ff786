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
import { allCases, caseKey, casesCorners, limitingCases, type Cases } from './cases.js';
import { qualityPasses, type Evaluation, type Evaluator } from './net-evaluation.js';
import type { NetKind } from './net-lookup.js';
import { formatIn } from '../units/quantity.js';

/** Re-simulates the net with `changes` on the given cases (all cases when null). */
export type Simulate = (changes?: NetBuildChanges, cases?: Cases | null) => ReceiverEdgeMeasure[];

/**
 * True when every closed edge of a window found on a case subset holds on the other cases too: they
 * pass there, with margins no smaller than the subset's (within 0.1 ps), so no other case limits the
 * edge. Margins are minima over cases, so subset and complement combine exactly.
 */
function confirmEdges(w: WindowSearchResult, subset: (length: number) => WindowProbe, others: (length: number) => WindowProbe): boolean {
  for (const [edge, open] of [[w.min, w.minOpen], [w.max, w.maxOpen]] as const) {
    if (edge === null || open) continue;
    const a = subset(edge);
    const b = others(edge);
    const ok = b.qualityPass && Math.min(b.setupMargin, b.holdMargin) >= Math.min(a.setupMargin, a.holdMargin) - 0.1e-12;
    if (!ok) return false;
  }
  return true;
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
  let w = searchLengthWindow(onSubset, segment.length);
  const othersCannotLimit = (edge: number): boolean => {
    // Linear bound: stretching the segment by dL shifts each corner's margins by its delay per metre
    // x dL, so corners drift apart by at most (spread of delay per metre) x dL. A case left out of
    // the search cannot limit the edge when it starts that far (plus 5 ps for reflections) above the
    // searched cases at the present length, in both margins, with its signal quality passing.
    const dpm = project.corners.map((c) => routedLine(project.stackup, segment.layer, segment.width, segment.spacing, c).delayPerMetre);
    const needed = (Math.max(...dpm) - Math.min(...dpm)) * Math.abs(edge - segment.length) + 5e-12;
    const at = (cases: Cases) => casesCorners(project, cases).map((c) => {
      const ms = measures.filter((m) => m.corner === c.name && cases.has(caseKey(m.corner, m.edge)));
      return { ...evaluate(ms, [c]), quality: qualityPasses(ms) };
    });
    const subset = at(limiting);
    const setupFloor = Math.min(...subset.map((e) => e.setup));
    const holdFloor = Math.min(...subset.map((e) => e.hold));
    return at(others).every((e) => e.quality && e.setup - setupFloor >= needed && e.hold - holdFloor >= needed);
  };
  const settled = (edge: number | null, open: boolean) => open || edge === null || othersCannotLimit(edge);
  const skipConfirm = settled(w.min, w.minOpen) && settled(w.max, w.maxOpen);
  let searched = onSubset;
  if (others.size > 0 && !skipConfirm && !confirmEdges(w, onSubset, probeAt(others))) {
    searched = probeAt(new Set(allCases(project)));
    w = searchLengthWindow(searched, segment.length);
  }
  // The window for margin >= the guard band (docs/design.md §6.3): the same search on margins less the
  // guard band, over the cases that set the window above (their probes are reused where lengths repeat).
  const guard = project.info.guardBand;
  const g = guard > 0
    ? searchLengthWindow((length) => {
      const p = searched(length);
      return { ...p, setupMargin: p.setupMargin - guard, holdMargin: p.holdMargin - guard };
    }, segment.length)
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

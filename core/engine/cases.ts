/**
 * (corner, edge) simulation cases of a net, and the subset that limits its margins now: searches
 * simulate only the limiting cases first (core/engine/net-window.ts).
 */
import type { Corner, ProjectData } from '../project/model.js';
import type { ReceiverEdgeMeasure } from '../budget/measures.js';
import type { NetBudget } from '../budget/net-budget.js';
import { qualityMarginVolts } from '../budget/quality.js';
import type { NetKind } from './net-lookup.js';

/** A set of (corner, edge) cases, each as "corner|edge". */
export type Cases = ReadonlySet<string>;
export const EDGES = ['rising', 'falling'] as const;
export const caseKey = (corner: string, edge: string): string => `${corner}|${edge}`;
/** The corner of a case key (caseKey's first part; a corner name may itself hold '|'). */
export const caseCorner = (key: string): string => key.slice(0, key.lastIndexOf('|'));
export const allCases = (project: ProjectData): string[] => project.corners.flatMap((c) => EDGES.map((e) => caseKey(c.name, e)));

/** The corners a case set touches, in project order. */
export function casesCorners(project: ProjectData, cases: Cases): Corner[] {
  return project.corners.filter((c) => EDGES.some((e) => cases.has(caseKey(c.name, e))));
}

/**
 * Cases that set the net's margins and signal quality now: the worst setup and worst hold (corner and
 * data edge) and the worst signal-quality measure. A strobe keeps both edges of each such corner (both
 * of its edges enter every budget).
 */
export function limitingCases(project: ProjectData, measures: readonly ReceiverEdgeMeasure[], budget: NetBudget | null, kind: NetKind): Set<string> {
  const worstQuality = measures.reduce((a, b) => (qualityMarginVolts(b) < qualityMarginVolts(a) ? b : a));
  const cases = new Set<string>([caseKey(worstQuality.corner, worstQuality.edge)]);
  if (budget) {
    const rank = (m: number | null) => (m === null ? -Infinity : m);
    const setup = budget.corners.reduce((a, b) => (rank(b.timing.setupMargin) < rank(a.timing.setupMargin) ? b : a));
    const hold = budget.corners.reduce((a, b) => (rank(b.timing.holdMargin) < rank(a.timing.holdMargin) ? b : a));
    cases.add(caseKey(setup.timing.corner, setup.setupCause.edge));
    cases.add(caseKey(hold.timing.corner, hold.holdCause.edge));
  }
  if (kind === 'strobe') {
    for (const c of casesCorners(project, cases)) for (const e of EDGES) cases.add(caseKey(c.name, e));
  }
  return cases;
}

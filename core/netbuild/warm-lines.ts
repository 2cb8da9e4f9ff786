/**
 * Solves every routed cross-section a board's nets use, at every corner, into the field memo
 * (docs/field-solver.md §10). A worker pool's threads each hold their own memo: solved once here,
 * before the pool takes jobs, they reach every worker as its seed instead of each worker solving them.
 * Two threads can share the solving (main/services/solve/lines-ahead.ts): each claims geometries by
 * index, so none is solved twice.
 */
import type { Corner, ProjectData, Stackup } from '../project/model.js';
import { routedLine } from './build-circuit.js';

/** One routed cross-section at one corner, as routedLine takes it. */
export interface LineGeometry {
  layer: string;
  width: number;
  spacing: number | undefined;
  corner: Corner;
}

/** Every distinct (layer, width, spacing) the nets route, at every corner, in the order the nets name them. */
export function routedLineGeometries(project: ProjectData): LineGeometry[] {
  const seen = new Set<string>();
  const out: LineGeometry[] = [];
  for (const net of project.nets) {
    for (const e of net.elements) {
      if (e.kind !== 'segment') continue;
      const geometry = `${e.layer}|${e.width}|${e.spacing}`;
      if (seen.has(geometry)) continue;
      seen.add(geometry);
      for (const corner of project.corners) out.push({ layer: e.layer, width: e.width, spacing: e.spacing, corner });
    }
  }
  return out;
}

/**
 * Solves the geometries this thread claims (`claim(index)`, default all) into the memo; returns how
 * many it solved or found.
 */
export function solveRoutedLines(stackup: Stackup, geometries: readonly LineGeometry[], claim: (index: number) => boolean = () => true): number {
  let count = 0;
  geometries.forEach((g, index) => {
    if (!claim(index)) return;
    count++;
    try {
      routedLine(stackup, g.layer, g.width, g.spacing, g.corner);
    } catch {
      // a section the stackup cannot give: the net's own job reports it, with the net named
    }
  });
  return count;
}

/** Solves every geometry of the board on this thread; returns how many (one per cross-section and corner). */
export function warmRoutedLines(project: ProjectData): number {
  return solveRoutedLines(project.stackup, routedLineGeometries(project));
}

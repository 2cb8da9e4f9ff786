/**
 * Solves every routed cross-section a board's nets use, at every corner, into the field memo
 * (docs/field-solver.md §10). A worker pool's threads each hold their own memo: solved once here,
 * before the pool takes jobs, they reach every worker as its seed instead of each worker solving them.
 */
import type { ProjectData } from '../project/model.js';
import { routedLine } from './build-circuit.js';

/** Returns how many distinct (layer, width, spacing) geometries were solved or found. */
export function warmRoutedLines(project: ProjectData): number {
  const seen = new Set<string>();
  for (const net of project.nets) {
    for (const e of net.elements) {
      if (e.kind !== 'segment') continue;
      const geometry = `${e.layer}|${e.width}|${e.spacing}`;
      if (seen.has(geometry)) continue;
      seen.add(geometry);
      for (const corner of project.corners) {
        try {
          routedLine(project.stackup, e.layer, e.width, e.spacing, corner);
        } catch {
          // a section the stackup cannot give: the net's own job reports it, with the net named
        }
      }
    }
  }
  return seen.size;
}

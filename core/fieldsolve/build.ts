/**
 * Builds the common PCB cross-sections from the dimensions engineers quote (docs/field-solver.md §2):
 * one trace or N equal traces at an edge gap, on a dielectric of height H1 over the bottom plane, with
 * either a second dielectric and a top plane (stripline, offset stripline), a dielectric cover and air
 * (embedded microstrip), or air and an optional conformal solder mask (microstrip).
 */
import type { ConformalMask, CrossSection, DielectricSlab } from './cross-section.js';

export interface PcbTraceGeometry {
  /** Foot width of each trace, m. */
  width: number;
  /** Copper thickness, m. */
  thickness: number;
  /** H1: dielectric between the bottom plane and the trace foot, m. */
  below: number;
  /** Dk of H1. */
  er: number;
  /**
   * H2: dielectric between the trace top and the top plane (stripline), or over the trace top
   * (embedded microstrip, then set `topPlane` false), m. The copper layer itself is filled with the
   * H2 material around the traces.
   */
  above?: number;
  /** Dk of H2 (default: er). */
  erAbove?: number;
  /** A top plane on the H2 dielectric (stripline). */
  topPlane?: boolean;
  /** Edge gap at the foot between neighbouring traces, m (pairs and N lines). */
  spacing?: number;
  /** Number of equal traces (default 1, or 2 when `spacing` is given). */
  count?: number;
  /** Etch factor T/undercut (default: rectangle). */
  etchFactor?: number;
  /** Conformal solder mask over an outer (microstrip) trace. */
  mask?: ConformalMask;
}

/** The cross-section of the geometry, traces centred on x = 0. Validation is the solver's. */
export function pcbCrossSection(g: PcbTraceGeometry): CrossSection {
  const layers: DielectricSlab[] = [{ thickness: g.below, er: g.er }];
  if (g.above !== undefined) layers.push({ thickness: g.thickness + g.above, er: g.erAbove ?? g.er });
  const count = g.count ?? (g.spacing === undefined ? 1 : 2);
  const pitch = g.width + (g.spacing ?? 0);
  const traces = [];
  for (let i = 0; i < count; i++) {
    traces.push({
      centre: (i - (count - 1) / 2) * pitch,
      width: g.width,
      thickness: g.thickness,
      base: g.below,
      ...(g.etchFactor === undefined ? {} : { etchFactor: g.etchFactor }),
    });
  }
  return { layers, topPlane: g.topPlane ?? false, traces, ...(g.mask ? { mask: g.mask } : {}) };
}

/**
 * A model's curves at one column, as plain arrays for a V-I / V-T view (docs/ibis.md §9): each V-I
 * table against its own table voltage with the reference it is measured from (§4, "The pad current"),
 * and each waveform table with its fixture. SI units (V, A, s, ohm, F).
 */
import { type BufferCorner, modelAtCorner } from './corner.js';
import type { Corner, IbisModel } from './types.js';

export interface ViCurveView {
  /** Table voltage, V (below the reference for pull-up and POWER clamp, above it for the others). */
  v: number[];
  /** Current into the pin, A. */
  i: number[];
  /** The rail the table voltage is measured from, V. */
  reference: number;
}

export interface VtCurveView {
  t: number[];
  v: number[];
  rFixture: number;
  vFixture: number;
  cFixture: number;
}

export interface ModelCurves {
  model: string;
  column: Corner;
  pullup: ViCurveView | null;
  pulldown: ViCurveView | null;
  gndClamp: ViCurveView | null;
  powerClamp: ViCurveView | null;
  rising: VtCurveView[];
  falling: VtCurveView[];
  cComp: number;
  vinl: number | null;
  vinh: number | null;
}

function vi(curve: BufferCorner['pullup'], reference: number): ViCurveView | null {
  return curve ? { v: Array.from(curve.v), i: Array.from(curve.i), reference } : null;
}

/** The V-I and V-T curves of a model at a column (typ, min or max). */
export function ibisCurvesAt(model: IbisModel, column: Corner): ModelCurves {
  const b = modelAtCorner(model, column);
  const vt = (w: BufferCorner['rising'][number]): VtCurveView => ({
    t: Array.from(w.t), v: Array.from(w.v), rFixture: w.rFixture, vFixture: w.vFixture, cFixture: w.cFixture,
  });
  return {
    model: model.name,
    column,
    pullup: vi(b.pullup, b.pullupRef),
    pulldown: vi(b.pulldown, b.pulldownRef),
    gndClamp: vi(b.gndClamp, b.gndClampRef),
    powerClamp: vi(b.powerClamp, b.powerClampRef),
    rising: b.rising.map(vt),
    falling: b.falling.map(vt),
    cComp: b.cComp,
    vinl: b.vinl,
    vinh: b.vinh,
  };
}

/**
 * One corner of a model: every typ/min/max choice made at once (docs/ibis.md §4, "Corners"): the V-I
 * and V-T tables, V_fixture, [Voltage Range], the reference voltages and C_comp all take column X.
 * Where a min or max value is NA the typ value is used (the standard's rule for NA).
 */
import type { Corner, IbisModel, Triple, ViTable, VtTable } from './types.js';

/** A V-I curve at one corner: current into the pin (A) against the table voltage (V). */
export interface Curve {
  v: Float64Array;
  i: Float64Array;
}

export interface CornerWaveform {
  /** Fixture: R_fixture to V_fixture (column X) with C_fixture at the pin (docs/ibis.md §5). */
  rFixture: number;
  vFixture: number;
  cFixture: number;
  lFixture: number;
  t: Float64Array;
  v: Float64Array;
  line: number;
}

/** Everything the behavioural buffer needs at one corner (SI units). */
export interface BufferCorner {
  model: string;
  corner: Corner;
  /** Voltages the tables are referenced to, V: pull-up and POWER clamp to their rail, pull-down and GND clamp to theirs. */
  pullupRef: number;
  pulldownRef: number;
  powerClampRef: number;
  gndClampRef: number;
  pullup: Curve | null;
  pulldown: Curve | null;
  gndClamp: Curve | null;
  powerClamp: Curve | null;
  cComp: number;
  rising: CornerWaveform[];
  falling: CornerWaveform[];
  /** [Ramp] of this corner: 20-80 % swing dv (V) over dt (s), per edge; null without [Ramp]. */
  ramp: { rising: { dv: number; dt: number }; falling: { dv: number; dt: number }; rLoad: number } | null;
  vinl: number | null;
  vinh: number | null;
  vmeas: number | null;
  rref: number | null;
  cref: number | null;
  vref: number | null;
}

export function pick(t: Triple, corner: Corner): number {
  return corner === 'typ' ? t.typ : t[corner] ?? t.typ;
}

function column<T>(c: { typ: T; min: T | null; max: T | null }, corner: Corner): T {
  return corner === 'typ' ? c.typ : c[corner] ?? c.typ;
}

function curve(table: ViTable | null, corner: Corner): Curve | null {
  return table ? { v: Float64Array.from(table.v), i: Float64Array.from(column(table.i, corner)) } : null;
}

function waveform(table: VtTable, corner: Corner): CornerWaveform {
  const f = table.fixture;
  return {
    rFixture: f.rFixture,
    vFixture: pick(f.vFixture, corner),
    cFixture: f.cFixture,
    lFixture: f.lFixture,
    t: Float64Array.from(table.t),
    v: Float64Array.from(column(table.v, corner)),
    line: table.line,
  };
}

/** The model at one corner. */
export function modelAtCorner(model: IbisModel, corner: Corner): BufferCorner {
  const range = model.voltageRange ? pick(model.voltageRange, corner) : null;
  const ref = (t: Triple | null, fallback: number | null) => (t ? pick(t, corner) : fallback ?? 0);
  const ramp = model.ramp;
  return {
    model: model.name,
    corner,
    pullupRef: ref(model.pullupReference, range),
    pulldownRef: ref(model.pulldownReference, 0),
    powerClampRef: ref(model.powerClampReference, range),
    gndClampRef: ref(model.gndClampReference, 0),
    pullup: curve(model.pullup, corner),
    pulldown: curve(model.pulldown, corner),
    gndClamp: curve(model.gndClamp, corner),
    powerClamp: curve(model.powerClamp, corner),
    cComp: model.cComp ? pick(model.cComp, corner) : 0,
    rising: model.rising.map((w) => waveform(w, corner)),
    falling: model.falling.map((w) => waveform(w, corner)),
    ramp: ramp ? { rising: column(ramp.rising, corner), falling: column(ramp.falling, corner), rLoad: ramp.rLoad } : null,
    vinl: model.vinl,
    vinh: model.vinh,
    vmeas: model.vmeas,
    rref: model.rref,
    cref: model.cref,
    vref: model.vref,
  };
}

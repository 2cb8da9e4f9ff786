/**
 * IBIS models into circuits (docs/ibis.md §7). `ibisDriver` and `ibisReceiver` turn a model at a
 * corner into what a circuit's driver or receiver needs (the pad data for the solver plus linear
 * equivalents for the measurements); `attachIbisModels` resolves the `ibis` references of a parsed net
 * file against files the host has read and parsed (core does no I/O).
 */
import { InputError } from '../errors.js';
import type { Circuit, DriverPad, DriverSpec, IbisCorner, PadSwitching, PadTables, ReceiverSpec, ReferenceLoad } from '../circuit/types.js';
import { type BufferCorner, modelAtCorner } from './corner.js';
import { slopeExtended } from './table.js';
import { type Switching, staticCoefficients, switchingCoefficients } from './switching.js';
import type { IbisFile, IbisModel } from './types.js';

function tables(b: BufferCorner): PadTables {
  return {
    pullupRef: b.pullupRef, pulldownRef: b.pulldownRef, powerClampRef: b.powerClampRef, gndClampRef: b.gndClampRef,
    pullup: b.pullup, pulldown: b.pulldown, gndClamp: b.gndClamp, powerClamp: b.powerClamp, cComp: b.cComp,
  };
}

/** First time a held table y(t) crosses `level`, by linear interpolation (t[0] when it starts past it). */
function crossing(t: Float64Array, y: Float64Array, level: number): number {
  const up = y[y.length - 1] >= y[0];
  for (let k = 0; k < t.length; k++) {
    if (up ? y[k] >= level : y[k] <= level) {
      if (k === 0) return t[0];
      return t[k - 1] + ((level - y[k - 1]) / (y[k] - y[k - 1])) * (t[k] - t[k - 1]);
    }
  }
  return t[t.length - 1];
}

/** Time after which both coefficients stay within 1 % of their final values, s. */
function settledTime(t: Float64Array, ku: Float64Array, kd: Float64Array): number {
  const n = t.length;
  for (let k = n - 1; k >= 0; k--) {
    if (Math.abs(ku[k] - ku[n - 1]) > 0.01 || Math.abs(kd[k] - kd[n - 1]) > 0.01) return t[Math.min(n - 1, k + 1)];
  }
  return t[0];
}

/** Lead-in of a static start added before a table that does not start static, s (1 fs: far below any step). */
const STATIC_LEAD = 1e-15;

/**
 * The coefficients the solver uses: the table's, preceded at t = 0 by the static state before the edge
 * when the table starts more than 0.01 away from it (the one-waveform rule holds the turning-off pull
 * at 0 from the table's start; the DC point before the edge is still the level being left).
 */
function withStaticStart(k: Switching, edge: 'rising' | 'falling', b: BufferCorner): Switching {
  const s = staticCoefficients(edge, 'before');
  const ku0 = b.pullup ? s.ku : 0;
  const kd0 = b.pulldown ? s.kd : 0;
  if (Math.abs(k.ku[0] - ku0) <= 0.01 && Math.abs(k.kd[0] - kd0) <= 0.01) return k;
  const shift = k.t[0] <= 0 ? STATIC_LEAD : 0;
  const t = Float64Array.of(0, ...Array.from(k.t, (x, i) => (i === 0 ? x + shift : x)));
  return { ...k, t, ku: Float64Array.of(ku0, ...k.ku), kd: Float64Array.of(kd0, ...k.kd) };
}

function padSwitching(b: BufferCorner, edge: 'rising' | 'falling'): PadSwitching & { settled: number } {
  const k = withStaticStart(switchingCoefficients(b, edge), edge, b);
  // The coefficient that turns on in this edge (Ku rising, Kd falling; the other one for a one-sided buffer).
  const on = (edge === 'rising') === (b.pullup !== null) ? k.ku : k.kd;
  const lo = on[0];
  const hi = on[on.length - 1];
  const t10 = crossing(k.t, on, lo + 0.1 * (hi - lo));
  const t90 = crossing(k.t, on, lo + 0.9 * (hi - lo));
  return { t: k.t, ku: k.ku, kd: k.kd, edgeTime: Math.max(t90 - t10, 1e-13), settled: settledTime(k.t, k.ku, k.kd) };
}

/** Small-signal resistance of a pull at its own rail (table voltage 0), ohm; 1 MΩ where the pull is absent. */
function railResistance(curve: BufferCorner['pullup']): number {
  if (!curve) return 1e6;
  const g = Math.abs(slopeExtended(curve.v, curve.i, 0));
  return g > 0 ? 1 / g : 1e6;
}

/**
 * A driver spec for `node` from an IBIS model at a corner. The pad carries the tables and both edges'
 * switching coefficients; vlow/vhigh are the pull-down and pull-up references, rout the pulls'
 * small-signal resistance at their rail, rise/fall time 0.8 × the time the coefficients settle within
 * 1 % (so the full ramp of the step and stop rules covers the edge), the reference load Rref to Vref
 * with Cref, and Vmeas.
 */
export function ibisDriver(node: string, model: IbisModel, corner: IbisCorner, label: string): DriverSpec {
  if (!model.pullup && !model.pulldown) {
    throw new InputError(label, `model ${model.name} (${model.modelType}) has no [Pullup] or [Pulldown]: it cannot drive`);
  }
  const b = modelAtCorner(model, corner);
  const rising = padSwitching(b, 'rising');
  const falling = padSwitching(b, 'falling');
  const pad: DriverPad = {
    ...tables(b), label,
    rising: { t: rising.t, ku: rising.ku, kd: rising.kd, edgeTime: rising.edgeTime },
    falling: { t: falling.t, ku: falling.ku, kd: falling.kd, edgeTime: falling.edgeTime },
  };
  const refLoad: ReferenceLoad | null = b.rref !== null && b.rref > 0 ? { ohms: b.rref, vtt: b.vref ?? 0, farads: b.cref ?? 0 } : null;
  return {
    node,
    vlow: b.pulldownRef,
    vhigh: b.pullupRef,
    routHigh: railResistance(b.pullup),
    routLow: railResistance(b.pulldown),
    riseTime: 0.8 * rising.settled,
    fallTime: 0.8 * falling.settled,
    refLoad,
    vmeas: b.vmeas,
    ibis: undefined,
    pad,
  };
}

/** The pad of an IBIS receiver at a corner (C_comp and clamps), with its Vinl/Vinh. */
export function ibisReceiver(model: IbisModel, corner: IbisCorner, label: string): { pad: PadTables & { label: string }; vinl: number | null; vinh: number | null } {
  const b = modelAtCorner(model, corner);
  // A receiver's pulls are off (Ku = Kd = 0): only clamps and C_comp act at its node.
  return { pad: { ...tables(b), pullup: null, pulldown: null, label }, vinl: b.vinl, vinh: b.vinh };
}

/** The .ibs files a circuit's `ibis` references name, without repeats. */
export function ibisFilesOf(circuit: Circuit): string[] {
  const files = new Set<string>();
  if (circuit.driver.ibis) files.add(circuit.driver.ibis.ref.file);
  for (const r of circuit.receivers) if (r.ibis) files.add(r.ibis.file);
  return [...files];
}

function findModel(files: ReadonlyMap<string, IbisFile>, file: string, model: string, field: string): IbisModel {
  const parsed = files.get(file);
  if (!parsed) throw new InputError(`${field}.file`, `IBIS file "${file}" was not read`);
  const found = parsed.models.find((m) => m.name === model);
  if (!found) {
    throw new InputError(`${field}.model`, `unknown model name "${model}" in ${file} (models: ${parsed.models.map((m) => m.name).join(', ')})`);
  }
  return found;
}

/**
 * A copy of the circuit with every `ibis` reference resolved: the driver's corner applies to the
 * receivers too (a linear driver uses typ). `where` prefixes field names (the net file's name).
 */
export function attachIbisModels(circuit: Circuit, files: ReadonlyMap<string, IbisFile>, where = 'net'): Circuit {
  const at = (field: string) => `${where}: ${field}`;
  const d = circuit.driver;
  const corner: IbisCorner = d.ibis?.corner ?? 'typ';
  let driver: DriverSpec = d;
  if (d.ibis) {
    const model = findModel(files, d.ibis.ref.file, d.ibis.ref.model, at('driver.ibis'));
    driver = { ...ibisDriver(d.node, model, corner, `${d.ibis.ref.file} ${model.name} ${corner}`), ibis: d.ibis };
  }
  const receivers: ReceiverSpec[] = circuit.receivers.map((r, index) => {
    if (!r.ibis) return r;
    const field = at(`receivers[${index}]`);
    const model = findModel(files, r.ibis.file, r.ibis.model, `${field}.ibis`);
    const rx = ibisReceiver(model, corner, `${r.ibis.file} ${model.name} ${corner}`);
    const vil = Number.isNaN(r.vil) ? rx.vinl : r.vil;
    const vih = Number.isNaN(r.vih) ? rx.vinh : r.vih;
    if (vil === null || vih === null) throw new InputError(`${field}.vil`, `model ${model.name} gives no Vinl/Vinh; give vil and vih in the net file`);
    if (!(vih > vil)) throw new InputError(`${field}.vih`, `must be above vil (${vil} V), got ${vih} V`);
    return { ...r, vil, vih, vref: Number.isNaN(r.vref ?? NaN) ? (vil + vih) / 2 : r.vref, pad: rx.pad };
  });
  return { ...circuit, driver, receivers };
}

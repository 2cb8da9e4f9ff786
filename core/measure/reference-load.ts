/**
 * The driver into its reference load (the load Tco is specified into, docs/design.md §4): the time its
 * output crosses Vmeas, so that flight time can be compensated: flight = t(receiver) - t(reference).
 */
import { InputError } from '../errors.js';
import type { Circuit, DriverSpec } from '../circuit/types.js';
import { firstCrossing } from './crossings.js';
import { fullRampTime } from '../circuit/topology.js';
import { type Edge, rampStart, simulateEdge } from '../solver/transient.js';

/** Driver output into `refLoad`, as a circuit of its own (a resistor to a VTT rail, optional C to ground). */
export function referenceLoadCircuit(driver: DriverSpec): Circuit {
  if (!driver.refLoad) throw new InputError('driver.refLoad', 'missing: the reference load Tco is specified into is needed for compensated flight time');
  const { ohms, vtt, farads } = driver.refLoad;
  const elements: Circuit['elements'] = [{ kind: 'resistor', a: driver.node, b: '#refvtt', ohms }];
  if (farads > 0) elements.push({ kind: 'capacitor', a: driver.node, b: 'gnd', farads });
  return { driver, elements, rails: { '#refvtt': vtt }, receivers: [], stop: null };
}

/** Output level of a source `vs` behind `r` into the load `ohms` to `vtt` (the divider above), V. */
function dividerLevel(vs: number, r: number, load: { ohms: number; vtt: number }): number {
  return (vs / r + load.vtt / load.ohms) / (1 / r + 1 / load.ohms);
}

/**
 * Resistive reference load, closed form: for t > 0 the output is the divider
 * v = (vs/Rn + Vtt/Rl)/(1/Rn + 1/Rl) (Ohm's and Kirchhoff's laws) of the linear ramp vs (from
 * rampStart to the new level), so Vmeas is crossed when vs = Rn·(Vmeas·(1/Rn + 1/Rl) − Vtt/Rl).
 */
function resistiveCrossing(driver: DriverSpec, edge: Edge, sourceStart?: number): number {
  const load = driver.refLoad!;
  const rising = edge === 'rising';
  const [v0, v1] = rising ? [driver.vlow, driver.vhigh] : [driver.vhigh, driver.vlow];
  const [rStart, rEdge] = rising ? [driver.routLow, driver.routHigh] : [driver.routHigh, driver.routLow];
  const vmeas = driver.vmeas ?? (driver.vlow + driver.vhigh) / 2;
  const start = dividerLevel(v0, rStart, load);
  const end = dividerLevel(v1, rEdge, load);
  const sign = rising ? 1 : -1;
  if (sign * (start - vmeas) >= 0 || sign * (end - vmeas) < 0) {
    throw new InputError(
      'driver.vmeas',
      `the ${edge} output never crosses ${vmeas} V into its reference load (${load.ohms} Ω to ${load.vtt} V): ` +
        `it goes from ${start.toFixed(3)} V to ${end.toFixed(3)} V`,
    );
  }
  const vs = rEdge * (vmeas * (1 / rEdge + 1 / load.ohms) - load.vtt / load.ohms);
  const ramp = fullRampTime(rising ? driver.riseTime : driver.fallTime);
  // where the source's ramp starts: the net's own when given (one source waveform for the net and its
  // reference load, docs/design.md §5), else as simulateEdge would start it into this load
  const from = sourceStart ?? rampStart(start, v0, rStart, rEdge);
  return Math.max(0, ((vs - from) / (v1 - from)) * ramp);
}

/**
 * Time from the start of the ramp at which the driver output, loaded by its reference load, crosses
 * Vmeas (default: midpoint of vlow and vhigh) in the direction of the edge, s. Step default: the full
 * ramp / 400 (and the load's RC / 20); crossing by linear interpolation. Throws InputError when the
 * output never reaches Vmeas into that load. `sourceStart`: where the ideal source's ramp starts in
 * the net being compensated (rampStart of the net's own DC pin level), so that an asymmetric driver
 * drives its reference load with the same source waveform as the net; resistive loads only (a
 * capacitive reference load is simulated with its own ramp start).
 */
export function referenceLoadCrossing(driver: DriverSpec, edge: Edge, options: { step?: number; sourceStart?: number } = {}): number {
  const circuit = referenceLoadCircuit(driver);
  const load = driver.refLoad!;
  // The closed form holds for the linear driver only; a behavioural pad (docs/ibis.md §4) is simulated.
  if (load.farads === 0 && options.step === undefined && !driver.pad) return resistiveCrossing(driver, edge, options.sourceStart);
  const ramp = fullRampTime(edge === 'rising' ? driver.riseTime : driver.fallTime);
  const rout = edge === 'rising' ? driver.routHigh : driver.routLow;
  const tau = (load.farads * load.ohms * rout) / (load.ohms + rout);
  const stop = ramp + 20 * tau + 1e-12;
  const candidates = [ramp / 400, tau / 20].filter((x) => x > 0);
  const step = options.step ?? (candidates.length ? Math.min(...candidates) : stop / 2);
  const wave = simulateEdge(circuit, edge, { step, stop });
  const vmeas = driver.vmeas ?? (driver.vlow + driver.vhigh) / 2;
  const out = wave.v[wave.nodes.indexOf(driver.node)];
  const t = firstCrossing(wave.t, out, vmeas, edge === 'rising' ? 'up' : 'down');
  if (t === null) {
    throw new InputError(
      'driver.vmeas',
      `the ${edge} output never crosses ${vmeas} V into its reference load (${load.ohms} Ω to ${load.vtt} V): ` +
        `it goes from ${out[0].toFixed(3)} V to ${out[out.length - 1].toFixed(3)} V`,
    );
  }
  return t;
}

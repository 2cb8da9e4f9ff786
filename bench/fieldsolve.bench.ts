/**
 * Field solver speed: wall time per cross-section solved to the default target (convergence estimate
 * <= 0.5 %), each given as a ratio to the closed form for the same structure measured in the same run
 * (Kirschning & Jansen 1984 for microstrip pairs, Cohn 1955 for stripline pairs, Hammerstad & Jensen
 * 1980 for single microstrip). The ratio says how many closed-form calls one field solve costs; the
 * milliseconds say whether a pair stays under the 50 ms budget on this machine (one core).
 * The cross-sections are invented for the benchmark.
 */
import {
  fieldPair, fieldSingleLine, fieldSpacingForZdiff, fieldWidthForZ0, pcbCrossSection, type PcbTraceGeometry,
} from '../core/fieldsolve/index.js';
import { cohnCoupledStripline, hammerstadJensenMicrostrip, kirschningJansenCoupledMicrostrip } from '../core/stackup/index.js';

const mil = 25.4e-6;
const REPEATS = 7;
let sink = 0;

/** Median wall time of one call, ms, over REPEATS calls after one warm-up call. */
function medianMs(fn: (i: number) => number): number {
  sink += fn(0);
  const times: number[] = [];
  for (let r = 0; r < REPEATS; r++) {
    const start = performance.now();
    sink += fn(r + 1);
    times.push(performance.now() - start);
  }
  times.sort((a, b) => a - b);
  return times[Math.floor(times.length / 2)];
}

/** Median time of one closed-form call, ms, from batches of at least 200 ms. */
function closedFormMs(fn: (i: number) => number): number {
  for (let i = 0; i < 1000; i++) sink += fn(i);
  const rates: number[] = [];
  for (let r = 0; r < 5; r++) {
    let calls = 0;
    const start = performance.now();
    while (performance.now() - start < 200) {
      for (let i = 0; i < 1000; i++) sink += fn(calls + i);
      calls += 1000;
    }
    rates.push((performance.now() - start) / calls);
  }
  rates.sort((a, b) => a - b);
  return rates[2];
}

export async function run(): Promise<void> {
  // Widths vary a little per call so no call repeats the previous geometry.
  const w = (base: number, i: number): number => (base + (i % 5) * 0.05) * mil;
  const microPair = (i: number): PcbTraceGeometry => ({ width: w(5, i), thickness: 1.4 * mil, below: 4 * mil, er: 4.3, spacing: 5 * mil });
  const stripPair = (i: number): PcbTraceGeometry => ({ width: w(4, i), thickness: 1.4 * mil, below: 5 * mil, above: 5 * mil, er: 4, topPlane: true, spacing: 4 * mil });
  const micro = (i: number): PcbTraceGeometry => ({ width: w(8, i), thickness: 1.4 * mil, below: 4 * mil, er: 4.3 });

  const kj = closedFormMs((i) => kirschningJansenCoupledMicrostrip(w(5, i), 5 * mil, 4 * mil, 4.3).zodd);
  const cohn = closedFormMs((i) => cohnCoupledStripline(w(4, i), 4 * mil, 11.4 * mil, 4).zodd);
  const hj = closedFormMs((i) => hammerstadJensenMicrostrip(w(8, i), 1.4 * mil, 4 * mil, 4.3).z0);

  const rows: [string, number, number, string][] = [];
  let estimate = 0;
  const track = (e: number): void => { estimate = Math.max(estimate, e); };
  rows.push(['microstrip pair W5 S5 h4 t1.4 mil', medianMs((i) => { const r = fieldPair(pcbCrossSection(microPair(i))); track(r.convergence.estimate); return r.zodd; }), kj, 'Kirschning & Jansen 1984']);
  rows.push(['stripline pair W4 S4 t1.4 b11.4 mil', medianMs((i) => { const r = fieldPair(pcbCrossSection(stripPair(i))); track(r.convergence.estimate); return r.zodd; }), cohn, 'Cohn 1955']);
  rows.push(['microstrip W8 h4 t1.4 mil', medianMs((i) => { const r = fieldSingleLine(pcbCrossSection(micro(i))); track(r.convergence.estimate); return r.z0; }), hj, 'Hammerstad & Jensen 1980']);
  rows.push(['microstrip W8 h4 t1.4 mil, 0.8 mil mask', medianMs((i) => fieldSingleLine(pcbCrossSection({ ...micro(i), mask: { thickness: 0.8 * mil, er: 3.5 } })).z0), hj, 'Hammerstad & Jensen 1980']);
  rows.push(['width for 50 ohm (microstrip)', medianMs((i) => fieldWidthForZ0(49 + (i % 3), { thickness: 1.4 * mil, below: 4 * mil, er: 4.3 }).width), hj, 'Hammerstad & Jensen 1980']);
  rows.push(['spacing for 90 ohm (microstrip pair)', medianMs((i) => fieldSpacingForZdiff(89 + (i % 3), { width: 5 * mil, thickness: 1.4 * mil, below: 4 * mil, er: 4.3 }).spacing), kj, 'Kirschning & Jansen 1984']);

  if (!Number.isFinite(sink)) throw new Error('bench: a field solve returned a non-finite value');
  console.log(`fieldsolve: median of ${REPEATS} solves each, default target (largest convergence estimate seen ${(estimate * 100).toFixed(2)} %)`);
  for (const [name, ms, ref, refName] of rows) {
    console.log(`  ${name.padEnd(42)} ${ms.toFixed(1).padStart(7)} ms   = ${(ms / ref).toExponential(2)} closed-form calls (${refName}, ${(ref * 1e6).toFixed(0)} ns each)`);
  }
  const pairMs = Math.max(rows[0][1], rows[1][1]);
  console.log(`  pair budget: ${pairMs.toFixed(1)} ms against 50 ms ${pairMs < 50 ? '(met)' : '(NOT met)'}`);
}

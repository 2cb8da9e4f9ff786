/**
 * Stackup engine throughput: calls per second of traceOnLayer (one per routing structure), widthForZ0
 * and spacingForZdiff, each also given as a ratio to a reference measured in the same run: one call of
 * Cohn's exact elliptic-integral stripline Z0 (cohnStriplineZ0, two AGM evaluations). The ratio says how
 * many reference calls one engine call costs, which stays comparable across machines.
 * The board below is invented for the benchmark.
 */
import type { Stackup, StackupLayer } from '../core/project/model.js';
import { cohnStriplineZ0, spacingForZdiff, traceOnLayer, widthForZ0 } from '../core/stackup/index.js';

const mil = 25.4e-6;
const dielectric = (name: string, t: number, dk: number): StackupLayer => ({ name, kind: 'dielectric', thickness: t * mil, dk, df: 0.02 });
const copper = (name: string, role: 'signal' | 'plane', t: number, w?: number): StackupLayer => ({
  name, kind: 'copper', role, thickness: t * mil, ...(w === undefined ? {} : { defaultWidth: w * mil }),
});

/** Invented eight-copper board: masked outer microstrip, symmetric and offset striplines, a covered bottom layer. */
const BOARD: Stackup = {
  name: 'bench board',
  layers: [
    { name: 'mask', kind: 'mask', thickness: 0.8 * mil, dk: 3.5 },
    copper('L1', 'signal', 1.9, 5),
    dielectric('d1', 4, 4.1),
    copper('L2', 'plane', 1.2),
    dielectric('d2', 5, 4.0),
    copper('L3', 'signal', 0.6, 4.5),
    dielectric('d3', 5, 4.0),
    copper('L4', 'plane', 1.2),
    dielectric('d4', 4, 3.7),
    copper('L5', 'signal', 0.6, 4),
    dielectric('d5', 12, 4.2),
    copper('L6', 'plane', 1.2),
    dielectric('d6', 4, 4.0),
    copper('L7', 'signal', 1.9, 5),
    dielectric('d7', 3, 3.8),
  ],
};

/** Minimum wall time per measurement, ms: long enough to swamp timer resolution and JIT warm-up noise. */
const MIN_MS = 300;
const REPEATS = 5;

let sink = 0; // consumed after timing so the JIT cannot drop the work

/** Median calls per second of `fn` over REPEATS batches, each batch at least MIN_MS long. */
function callsPerSecond(fn: (i: number) => number): number {
  for (let i = 0; i < 200; i++) sink += fn(i); // warm-up
  const rates: number[] = [];
  for (let r = 0; r < REPEATS; r++) {
    let calls = 0;
    const start = performance.now();
    let elapsed = 0;
    while (elapsed < MIN_MS) {
      for (let i = 0; i < 100; i++) sink += fn(calls + i);
      calls += 100;
      elapsed = performance.now() - start;
    }
    rates.push((calls * 1000) / elapsed);
  }
  rates.sort((a, b) => a - b);
  return rates[Math.floor(rates.length / 2)];
}

export interface StackupBenchRow {
  name: string;
  callsPerSecond: number;
  /** Reference calls per second divided by this row's: the cost of one call in reference calls. */
  costInReferenceCalls: number;
}

export async function run(): Promise<void> {
  // Widths vary a little per call so no call is a repeat of the previous one.
  const w = (i: number): number => (4 + (i % 7) * 0.1) * mil;
  const reference = callsPerSecond((i) => cohnStriplineZ0(w(i), 10.6 * mil, 4));

  // The closed forms by name: the field path (chosen by default for masked, thick, offset and pair
  // geometry) has its own benchmark, bench/fieldsolve.bench.ts.
  const closed = { solver: 'closed-form' } as const;
  const cases: [string, (i: number) => number][] = [
    ['traceOnLayer, microstrip (L1)', (i) => traceOnLayer(BOARD, 'L1', w(i), undefined, closed).z0],
    ['traceOnLayer, stripline (L3)', (i) => traceOnLayer(BOARD, 'L3', w(i), undefined, closed).z0],
    ['traceOnLayer, offset stripline (L5)', (i) => traceOnLayer(BOARD, 'L5', w(i), undefined, closed).z0],
    ['traceOnLayer, embedded microstrip (L7)', (i) => traceOnLayer(BOARD, 'L7', w(i), undefined, closed).z0],
    ['traceOnLayer, slow corner (Dk x 1.1, -0.5 mil)', (i) => traceOnLayer(BOARD, 'L3', w(i), { dkFactor: 1.1, widthDelta: -0.5 * mil }, closed).z0],
    ['widthForZ0 50 ohm, microstrip', (i) => widthForZ0(48 + (i % 5), { structure: 'microstrip', thickness: 1.9 * mil, below: 4 * mil, er: 4.1 }, closed)],
    ['widthForZ0 50 ohm, offset stripline', (i) => widthForZ0(48 + (i % 5), { structure: 'offset-stripline', thickness: 0.6 * mil, below: 4 * mil, above: 12 * mil, er: 4.0 }, closed)],
    ['spacingForZdiff 100 ohm, microstrip', (i) => spacingForZdiff(95 + (i % 5), { structure: 'microstrip', width: 5 * mil, thickness: 1.9 * mil, below: 4 * mil, er: 4.1 }, closed)],
    ['spacingForZdiff 100 ohm, stripline', (i) => spacingForZdiff(95 + (i % 5), { structure: 'stripline', width: 4 * mil, thickness: 0.6 * mil, below: 5 * mil, er: 4.0 }, closed)],
  ];

  const rows: StackupBenchRow[] = cases.map(([name, fn]) => {
    const rate = callsPerSecond(fn);
    return { name, callsPerSecond: rate, costInReferenceCalls: reference / rate };
  });

  if (!Number.isFinite(sink)) throw new Error('bench: a stackup call returned a non-finite value');
  const fmt = (v: number): string => (v >= 1e6 ? `${(v / 1e6).toFixed(2)} M/s` : `${(v / 1e3).toFixed(1)} k/s`);
  console.log(`stackup: median of ${REPEATS} batches of >= ${MIN_MS} ms each`);
  console.log(`  reference: cohnStriplineZ0 (Cohn 1954, elliptic integrals by AGM)  ${fmt(reference)}`);
  for (const r of rows) {
    console.log(`  ${r.name.padEnd(48)} ${fmt(r.callsPerSecond).padStart(10)}   = ${r.costInReferenceCalls.toFixed(1)} reference calls each`);
  }
}

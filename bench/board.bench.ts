/**
 * Whole-board check of the demo project (119 nets, every corner, both edges, length windows and
 * termination suggestions included): wall time and nets/second on one thread (solveBoardSync) and on
 * the worker pool (os.availableParallelism() threads), each with an empty results cache; plus the
 * same without the length-window search (what the base budget costs) and a fully cached re-check.
 * Target (docs/design.md §1.2): the 100+ net demo in under 2 s on 2 cores. Times are medians of 3 runs after one
 * warm-up run; the machine's other load shows in them (print `uptime` beside the numbers).
 */
import { availableParallelism } from 'node:os';
import { buildDemoProject } from '../fixtures/demo/demo-project.js';
import { SolveService } from '../main/services/solve/solve-service.js';
import { memoryStore } from './memory-store.js';
import type { SolveOptions } from '../core/engine/solve-net.js';

const RUNS = 3;

function median(values: number[]): number {
  const sorted = [...values].sort((a, b) => a - b);
  return sorted[Math.floor(sorted.length / 2)];
}

/** Median wall time of RUNS solves, each with an empty cache, ms. */
async function measure(fn: () => Promise<unknown>, clear: () => void): Promise<number> {
  const times: number[] = [];
  for (let i = 0; i < RUNS; i++) {
    clear();
    const start = performance.now();
    await fn();
    times.push(performance.now() - start);
  }
  return median(times);
}

function line(label: string, nets: number, ms: number, simulations: number): void {
  console.log(
    `${label.padEnd(48)} ${ms.toFixed(0).padStart(6)} ms  ${(nets / (ms / 1000)).toFixed(1).padStart(7)} nets/s  ${String(simulations).padStart(6)} simulations`,
  );
}

export async function run(): Promise<void> {
  const cores = availableParallelism();
  const nets = buildDemoProject().nets.length;
  console.log(`demo board: ${nets} nets x 3 corners x 2 edges; ${cores} cores available`);

  const variants: { name: string; options: SolveOptions }[] = [
    { name: 'full check (windows + suggestions)', options: {} },
    { name: 'budgets only (no length windows)', options: { lengthWindow: false } },
  ];
  for (const variant of variants) {
    const store = memoryStore(buildDemoProject()); // in memory: the benchmark measures solving, not SQLite
    const single = new SolveService(store, { workers: 0, solve: variant.options });
    const pooled = new SolveService(store, { workers: cores, solve: variant.options });
    // warm-up: one whole solve each, so the JIT has compiled the hot paths on this thread and in every
    // worker (where tsx also compiles the sources once)
    await single.solveBoardSync();
    store.clear();
    await pooled.solveBoard();

    const t1 = await measure(() => single.solveBoardSync(), store.clear);
    line(`${variant.name}, 1 thread`, nets, t1, single.lastStats.simulations);
    const tp = await measure(() => pooled.solveBoard(), store.clear);
    line(`${variant.name}, pool of ${cores}`, nets, tp, pooled.lastStats.simulations);
    console.log(`${''.padEnd(48)} speed-up ${(t1 / tp).toFixed(2)}x; target < 2000 ms on 2 cores: ${tp < 2000 ? 'met' : 'NOT met'}`);
    const tc = await measure(() => pooled.solveBoard(), () => undefined);
    line(`${variant.name}, all from cache`, nets, tc, pooled.lastStats.simulations);
    await pooled.close();
  }
}

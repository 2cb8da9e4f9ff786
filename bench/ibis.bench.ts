/**
 * Cost of IBIS buffers in the transient solver (docs/ibis.md §4): each invented IBIS net of
 * fixtures/ibis/ against the same net with a linear driver (the IBIS driver's linear equivalents,
 * C_comp as receiver capacitance, no pads), both edges as the board check runs them (one simulateNet
 * call, reused sample storage), at the same step and stop, measured in the same run, in CPU time of
 * interleaved rounds. The ratio (IBIS / linear) is the figure to watch; the acceptance is at most 3x.
 * Measured 3 December 2026 on the shared 2-core build machine, two runs: 1.7-1.8x on the series and
 * fly-by nets, 2.1-2.2x on the point-to-point and ramp-only nets, 2.5x on the coupled-pad net (before
 * the kept segment roots and the per-matrix pad solvers of core/solver/pad.ts: 2.9-3.4x measured
 * this way).
 */
import { readFileSync } from 'node:fs';
import { parseNetFile } from '../core/circuit/parse.js';
import type { Circuit } from '../core/circuit/types.js';
import { attachIbisModels, ibisFilesOf } from '../core/ibis/attach.js';
import { parseIbis } from '../core/ibis/parse.js';
import { chooseStep, chooseStop, simulateNet, WaveformBuffers } from '../core/solver/transient.js';

const NETS = ['net-p2p-clamp.json', 'net-series.json', 'net-flyby.json', 'net-ramp-only.json', 'net-coupled-inputs.json'];
const url = (f: string) => new URL(`../fixtures/ibis/${f}`, import.meta.url);

function load(name: string): Circuit {
  const c = parseNetFile(JSON.parse(readFileSync(url(name), 'utf8')), name);
  return attachIbisModels(c, new Map(ibisFilesOf(c).map((f) => [f, parseIbis(readFileSync(url(f), 'utf8'), f)])), name);
}

/** The same net with a linear driver and plain receivers (C_comp kept as input capacitance). */
function linearTwin(c: Circuit): Circuit {
  const { pad, ibis, ...driver } = c.driver;
  void ibis;
  // The linear driver's full ramp = the pad's settling time would set a coarser step; the step is forced below.
  void pad;
  return {
    ...c,
    driver,
    receivers: c.receivers.map(({ pad: rp, ibis: ri, ...r }) => {
      void ri;
      return { ...r, cin: r.cin + (rp?.cComp ?? 0) };
    }),
  };
}

const MIN_MS = 150;
const ROUNDS = 7;
let sink = 0;

/**
 * CPU time of one call of fn, ms, over a batch of at least MIN_MS wall time. CPU time (user + system
 * of this process) rather than wall time: the cores are shared, and waiting for them is not cost.
 */
function batch(fn: () => number): number {
  let calls = 0;
  const start = performance.now();
  const cpu0 = process.cpuUsage();
  let now = start;
  while (now - start < MIN_MS) {
    sink += fn();
    calls++;
    now = performance.now();
  }
  const cpu = process.cpuUsage(cpu0);
  return (cpu.user + cpu.system) / 1000 / calls;
}

/**
 * Median of ROUNDS interleaved rounds (linear batch, then IBIS batch): the two sides see the same
 * machine load (other processes share the cores), and the median ratio drops rounds that one side
 * spent waiting.
 */
function compare(linear: () => number, ibis: () => number): { lin: number; nl: number; ratio: number } {
  for (let i = 0; i < 3; i++) sink += linear() + ibis();
  const rounds: { lin: number; nl: number; ratio: number }[] = [];
  for (let r = 0; r < ROUNDS; r++) {
    const lin = batch(linear);
    const nl = batch(ibis);
    rounds.push({ lin, nl, ratio: nl / lin });
  }
  rounds.sort((a, b) => a.ratio - b.ratio);
  return rounds[Math.floor(ROUNDS / 2)];
}

export function run(): void {
  console.log('CPU time per net (both edges), median of interleaved rounds');
  console.log('net                        steps   linear ms   IBIS ms   ratio IBIS/linear');
  let worst = 0;
  for (const name of NETS) {
    const ibis = load(name);
    const linear = linearTwin(ibis);
    const stop = chooseStop(ibis);
    const step = Math.min(chooseStep(ibis, 'rising', stop), chooseStep(ibis, 'falling', stop));
    // Both edges as the board check runs them (core/engine/simulate-net.ts): one simulateNet call,
    // one compiled circuit for both edges, sample storage reused between calls.
    const buffers = new WaveformBuffers();
    const both = (c: Circuit) => () => {
      const { rising: r, falling: f } = simulateNet(c, { stop, step, buffers });
      return r.v[0][r.t.length - 1] + f.v[0][f.t.length - 1];
    };
    const { lin, nl } = compare(both(linear), both(ibis));
    worst = Math.max(worst, nl / lin);
    const n = 2 * Math.ceil(stop / step);
    console.log(`${name.padEnd(26)} ${String(n).padStart(6)}   ${lin.toFixed(3).padStart(9)}   ${nl.toFixed(3).padStart(7)}   ${(nl / lin).toFixed(2)}x`);
  }
  console.log(`largest ratio ${worst.toFixed(2)}x (acceptance: at most 3x)`);
  if (sink === 42) console.log('');
}

/**
 * Net solver throughput against ngspice (docs/design.md §1.2): 240 generated nets of six topologies, both edges,
 * simulated by this solver (plus every measurement of every receiver) and by ngspice, in one run.
 *
 * How ngspice is run, to be fair to it: ONE ngspice process (batch mode) `source`s all 480 decks
 * (one per net and edge) from a master control script, runs each and frees it, without writing any
 * waveform; so process start-up is paid once, not per net. Its time step is bounded by TMAX = the
 * step this solver chose for the same net and edge (the same time resolution), and its lossless
 * lines use REL=ABS=10 breakpoint control (see scripts/ngspice.ts). Both sides run the same
 * number of rounds, back to back in each round; this solver reuses its sample storage from net to net
 * as the board check does (WaveformBuffers), and is warmed up to its steady state first (WARM_UP_PASSES); the ratios are of the best round of each, in CPU time
 * (this thread for the solver, the child process for ngspice) and in wall time. The accuracy of both
 * at these settings is checked on every bench net and edge against a fine (TMAX 1 ps) ngspice run.
 */
import { execFileSync } from 'node:child_process';
import { mkdtempSync, readFileSync, rmSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { GROUND, type Circuit, type CircuitElement, type ReceiverSpec } from '../core/circuit/types.js';
import { checkCircuit } from '../core/circuit/topology.js';
import { chooseStep, chooseStop, simulateNet, WaveformBuffers } from '../core/solver/transient.js';
import { marchKernel } from '../core/solver/march.js';
import { measureReceivers } from '../core/measure/net.js';
import { valueAt } from '../core/measure/crossings.js';
import { parseWrdata, spiceDeck, spiceNodes } from '../scripts/ngspice.js';
import { mulberry32 } from '../scripts/prng.js';

const NETS = 240;
/** Rounds; each is one pass of each side, so both get the same number of tries. */
const PASSES = 8;
/**
 * Untimed passes of this solver before the rounds: V8 compiles the hot functions in tiers over the
 * first passes (about 10x slower on the first than from the tenth on), while ngspice is compiled
 * ahead of time. A board check runs thousands of simulations, so the steady state is what it sees;
 * the first pass is printed too.
 */
const WARM_UP_PASSES = 12;

const prng = mulberry32;

const TOPOLOGIES = ['point-to-point', 'series', 'layer-change', 'fly-by', 'thevenin', 't-branch-ac'] as const;

/** One invented net of the given topology with random but plausible values. */
export function generate(index: number): Circuit {
  const r = prng(1000 + index);
  const pick = (lo: number, hi: number) => lo + (hi - lo) * r();
  const topology = TOPOLOGIES[index % TOPOLOGIES.length];
  const vhigh = [1.2, 1.5, 1.8, 3.3][Math.floor(r() * 4)];
  const rise = pick(200e-12, 600e-12);
  const rx = (node: string): ReceiverSpec => ({
    node, vil: 0.35 * vhigh, vih: 0.65 * vhigh, vref: 0.5 * vhigh, cin: pick(0.5e-12, 3e-12), odt: null, vmaxAbs: null, vminAbs: null,
  });
  const z = () => pick(40, 65);
  const td = (lo: number, hi: number) => pick(lo, hi);
  const elements: CircuitElement[] = [];
  const receivers: ReceiverSpec[] = [];
  const rails: Record<string, number> = {};
  const rout = pick(15, 45);
  // Half the drivers are symmetric (one resistance, equal edges), as many part models are; the rest
  // have a weaker pull-up and a different fall time, so both code paths are timed. Drawn from the
  // generator, independently of the topology (which cycles with the index).
  const symmetric = r() < 0.5;
  const routHigh = symmetric ? rout : rout * pick(1.05, 1.4);
  const fall = symmetric ? rise : rise * pick(0.8, 1.2);
  switch (topology) {
    case 'point-to-point':
      elements.push({ kind: 'line', a: 'drv', b: 'rx', z0: z(), delay: td(0.2e-9, 1.5e-9) });
      receivers.push(rx('rx'));
      break;
    case 'series':
      elements.push({ kind: 'resistor', a: 'drv', b: 's', ohms: pick(15, 35) });
      elements.push({ kind: 'line', a: 's', b: 'rx', z0: z(), delay: td(0.3e-9, 1.5e-9) });
      receivers.push(rx('rx'));
      break;
    case 'layer-change':
      elements.push({ kind: 'line', a: 'drv', b: 'v1', z0: z(), delay: td(0.1e-9, 0.6e-9) });
      elements.push({ kind: 'via', a: 'v1', farads: pick(0.2e-12, 0.6e-12) });
      elements.push({ kind: 'line', a: 'v1', b: 'rx', z0: z(), delay: td(0.2e-9, 1e-9) });
      receivers.push(rx('rx'));
      break;
    case 'fly-by': {
      const z0 = z();
      elements.push({ kind: 'line', a: 'drv', b: 'n1', z0, delay: td(0.2e-9, 0.6e-9) });
      const stubs = 2 + Math.floor(r() * 3);
      for (let k = 1; k <= stubs; k++) {
        elements.push({ kind: 'line', a: `n${k}`, b: `r${k}`, z0: z(), delay: td(30e-12, 80e-12) });
        receivers.push(rx(`r${k}`));
        elements.push({ kind: 'line', a: `n${k}`, b: k === stubs ? 'end' : `n${k + 1}`, z0, delay: td(80e-12, 200e-12) });
      }
      elements.push({ kind: 'resistor', a: 'end', b: 'vtt', ohms: z0 });
      rails.vtt = vhigh / 2;
      break;
    }
    case 'thevenin': {
      elements.push({ kind: 'line', a: 'drv', b: 'rx', z0: z(), delay: td(0.3e-9, 1.5e-9) });
      const rt = pick(90, 150);
      elements.push({ kind: 'resistor', a: 'rx', b: 'vdd', ohms: rt });
      elements.push({ kind: 'resistor', a: 'rx', b: 'gnd', ohms: rt });
      rails.vdd = vhigh;
      receivers.push(rx('rx'));
      break;
    }
    case 't-branch-ac':
      elements.push({ kind: 'inductor', a: 'drv', b: 'pin', henries: pick(1e-9, 3e-9) });
      elements.push({ kind: 'capacitor', a: 'pin', b: 'gnd', farads: pick(0.3e-12, 1e-12) });
      elements.push({ kind: 'line', a: 'pin', b: 't', z0: z(), delay: td(0.2e-9, 0.8e-9) });
      elements.push({ kind: 'line', a: 't', b: 'ra', z0: z(), delay: td(0.1e-9, 0.5e-9) });
      elements.push({ kind: 'line', a: 't', b: 'rb', z0: z(), delay: td(0.1e-9, 0.5e-9) });
      elements.push({ kind: 'resistor', a: 'rb', b: 'ac', ohms: pick(40, 70) });
      elements.push({ kind: 'capacitor', a: 'ac', b: 'gnd', farads: pick(20e-12, 100e-12) });
      receivers.push(rx('ra'), rx('rb'));
      break;
  }
  const circuit: Circuit = {
    driver: {
      node: 'drv', vlow: 0, vhigh, routHigh, routLow: rout, riseTime: rise, fallTime: fall,
      refLoad: { ohms: 50, vtt: vhigh / 2, farads: 0 }, vmeas: vhigh / 2,
    },
    elements,
    rails,
    receivers,
    stop: null,
  };
  checkCircuit(circuit, `generated net ${index}`);
  return circuit;
}

export interface SolverBenchResult {
  nets: number;
  solverNetsPerSecond: number;
  ngspiceNetsPerSecond: number;
  /** ngspice CPU time / this solver's CPU time, best round each. */
  cpuRatio: number;
  /** The same for wall time. */
  wallRatio: number;
  solverMaxDeviation: number;
  ngspiceMaxDeviation: number;
}

/** CPU seconds of this process so far (user + system; the solver runs on this thread only). */
function ownCpu(): number {
  const u = process.cpuUsage();
  return (u.user + u.system) / 1e6;
}

/** CPU seconds of every child process that has ended so far: proc(5) fields cutime, cstime (100 ticks per second). */
function childCpu(): number {
  const fields = readFileSync('/proc/self/stat', 'utf8').split(') ')[1].split(' ');
  return (Number(fields[13]) + Number(fields[14])) / 100;
}

/** Probes of every node but ground and rails, as the deck names them. */
function probes(c: Circuit): string {
  return [...spiceNodes(c).entries()].filter(([n]) => n !== GROUND && !(n in c.rails)).map(([, sp]) => `v(${sp})`).join(' ');
}

export async function run(): Promise<SolverBenchResult> {
  const circuits = Array.from({ length: NETS }, (_, i) => generate(i));
  const symmetric = circuits.map((c) => c.driver.routHigh === c.driver.routLow && c.driver.riseTime === c.driver.fallTime);

  // ngspice decks: one process sources all of them from one master script.
  const dir = mkdtempSync(join(tmpdir(), 'slackline-bench-spice-'));
  const masterFile = join(dir, 'master.cir');
  const master = ['* slackline benchmark master', '.control', 'set noaskquit'];
  circuits.forEach((c, i) => {
    const stop = chooseStop(c);
    for (const edge of ['rising', 'falling'] as const) {
      const file = join(dir, `net${i}-${edge}.cir`);
      writeFileSync(file, spiceDeck(c, edge, { stop, tmax: chooseStep(c, edge, stop), control: false }, `net ${i}`));
      master.push(`source ${file}`, 'run', 'destroy all', 'remcirc');
    }
  });
  master.push('quit', '.endc', '.end', '');
  writeFileSync(masterFile, master.join('\n'));

  // Equal rounds: each round is one pass of this solver (simulate + measure every receiver of every
  // net) and one ngspice pass over the same nets, back to back so both see the same machine load; each
  // side reports its best round, in CPU time and in wall time. The solver is warmed up first (JIT).
  // Sample storage reused from net to net, as the board check does (core/engine/simulate-net.ts).
  const buffers = new WaveformBuffers();
  const warmUp: number[] = [];
  for (let pass = 0; pass < WARM_UP_PASSES; pass++) {
    const t = performance.now();
    for (const c of circuits) measureReceivers(c, simulateNet(c, { buffers }));
    warmUp.push((performance.now() - t) / 1000);
  }
  let samples = 0;
  const solver: { wall: number; cpu: number }[] = [];
  const spice: { wall: number; cpu: number }[] = [];
  try {
    for (let pass = 0; pass < PASSES; pass++) {
      samples = 0;
      const c0 = ownCpu();
      const t0 = performance.now();
      for (const c of circuits) {
        const waves = simulateNet(c, { buffers });
        measureReceivers(c, waves);
        samples += waves.rising.t.length + waves.falling.t.length;
      }
      solver.push({ wall: (performance.now() - t0) / 1000, cpu: ownCpu() - c0 });
      const k0 = childCpu();
      const t1 = performance.now();
      execFileSync('ngspice', ['-b', masterFile], { stdio: 'ignore', timeout: 1_800_000 });
      spice.push({ wall: (performance.now() - t1) / 1000, cpu: childCpu() - k0 });
    }

    // Accuracy at the benchmarked settings on EVERY bench net and edge: this solver and ngspice at the
    // same step, both against ngspice at TMAX 1 ps (one ngspice process writes every run's waveforms).
    const accuracy = ['* slackline accuracy master', '.control', 'set noaskquit', 'set wr_singlescale', 'set wr_vecnames'];
    circuits.forEach((c, i) => {
      const stop = chooseStop(c);
      for (const edge of ['rising', 'falling'] as const) {
        for (const [tag, tmax] of [['fine', 1e-12], ['coarse', chooseStep(c, edge, stop)]] as const) {
          const deck = join(dir, `acc${i}-${edge}-${tag}.cir`);
          writeFileSync(deck, spiceDeck(c, edge, { stop, tmax, control: false }, `net ${i} ${tag}`));
          accuracy.push(`source ${deck}`, 'run', `wrdata ${join(dir, `acc${i}-${edge}-${tag}.txt`)} ${probes(c)}`, 'destroy all', 'remcirc');
        }
      }
    });
    accuracy.push('quit', '.endc', '.end', '');
    const accuracyFile = join(dir, 'accuracy.cir');
    writeFileSync(accuracyFile, accuracy.join('\n'));
    execFileSync('ngspice', ['-b', accuracyFile], { stdio: 'ignore', timeout: 3_600_000 });
    const solverDevs: number[] = [];
    const spiceDevs: number[] = [];
    circuits.forEach((c, i) => {
      const stop = chooseStop(c);
      const swing = c.driver.vhigh - c.driver.vlow;
      const waves = simulateNet(c);
      for (const edge of ['rising', 'falling'] as const) {
        const fine = parseWrdata(readFileSync(join(dir, `acc${i}-${edge}-fine.txt`), 'utf8'), c);
        const coarse = parseWrdata(readFileSync(join(dir, `acc${i}-${edge}-coarse.txt`), 'utf8'), c);
        const mine = waves[edge];
        if (mine.t[mine.t.length - 1] < stop * (1 - 1e-9)) throw new Error(`net ${i}: the solver stopped early`);
        let dMine = 0;
        let dSpice = 0;
        for (const [k, node] of mine.nodes.entries()) {
          const ref = fine.v[node];
          for (let q = 0; q < fine.t.length; q++) {
            dMine = Math.max(dMine, Math.abs(valueAt(mine.t, mine.v[k], fine.t[q]) - ref[q]) / swing);
            dSpice = Math.max(dSpice, Math.abs(valueAt(coarse.t, coarse.v[node], fine.t[q]) - ref[q]) / swing);
          }
        }
        solverDevs.push(dMine);
        spiceDevs.push(dSpice);
      }
    });
    accuracyStats = { solver: solverDevs, spice: spiceDevs };
  } finally {
    rmSync(dir, { recursive: true, force: true });
  }
  // Transparency: symmetric drivers get their falling edge by superposition (one march per net).
  const subset = (keep: (i: number) => boolean) => {
    const list = circuits.filter((_, i) => keep(i));
    let best = Infinity;
    for (let pass = 0; pass < 5; pass++) {
      const t = performance.now();
      for (const c of list) measureReceivers(c, simulateNet(c, { buffers }));
      best = Math.min(best, performance.now() - t);
    }
    return best / list.length;
  };
  const symmetricMs = subset((i) => symmetric[i]);
  const asymmetricMs = subset((i) => !symmetric[i]);
  // The time loop alone: simulate (no measuring) with the WebAssembly kernel and with the JavaScript
  // loop it mirrors (core/solver/march.ts), rounds interleaved, best of each.
  const loops = { wasm: Infinity, js: Infinity };
  for (let pass = 0; pass < 2 * PASSES; pass++) {
    const loop = pass % 2 === 0 ? 'auto' : 'js';
    const t = performance.now();
    for (const c of circuits) simulateNet(c, { buffers, loop });
    const ms = performance.now() - t;
    if (loop === 'js') loops.js = Math.min(loops.js, ms);
    else loops.wasm = Math.min(loops.wasm, ms);
  }
  const best = (xs: { wall: number; cpu: number }[]) => ({ wall: Math.min(...xs.map((x) => x.wall)), cpu: Math.min(...xs.map((x) => x.cpu)) });
  const mine = best(solver);
  const theirs = best(spice);
  const { solver: solverDevs, spice: spiceDevs } = accuracyStats!;
  const worst = (xs: number[]) => Math.max(...xs);
  const p95 = (xs: number[]) => [...xs].sort((a, b) => a - b)[Math.floor(0.95 * (xs.length - 1))];

  const result: SolverBenchResult = {
    nets: NETS,
    solverNetsPerSecond: NETS / mine.wall,
    ngspiceNetsPerSecond: NETS / theirs.wall,
    cpuRatio: theirs.cpu / mine.cpu,
    wallRatio: theirs.wall / mine.wall,
    solverMaxDeviation: worst(solverDevs),
    ngspiceMaxDeviation: worst(spiceDevs),
  };
  const pct = (x: number) => `${(100 * x).toFixed(2)} %`;
  console.log(`solver: ${NETS} generated nets (${TOPOLOGIES.join(', ')}; ${symmetric.filter(Boolean).length} with a symmetric driver), both edges each`);
  console.log(`  this solver (simulate + measure every receiver), best of ${PASSES} rounds: CPU ${(1000 * mine.cpu).toFixed(1)} ms, wall ${(1000 * mine.wall).toFixed(1)} ms = ${result.solverNetsPerSecond.toFixed(1)} nets/s` +
    ` (${((1000 * mine.wall) / NETS / 2).toFixed(3)} ms per net-edge, ${Math.round(samples / NETS / 2)} samples per edge on average)`);
  console.log(`    warm-up (untimed, ${WARM_UP_PASSES} passes before the rounds): first pass ${warmUp[0].toFixed(3)} s wall (while V8 compiles), last ${warmUp[warmUp.length - 1].toFixed(3)} s`);
  console.log(`    per net: ${symmetricMs.toFixed(3)} ms with a symmetric driver (falling edge by superposition), ${asymmetricMs.toFixed(3)} ms with an asymmetric one (two marches)`);
  console.log(marchKernel() === null
    ? '    time loop: the WebAssembly kernel is not available here; the JavaScript loop ran'
    : `    simulation only (no measuring), ${NETS} nets: WebAssembly time loop ${loops.wasm.toFixed(1)} ms, JavaScript loop ${loops.js.toFixed(1)} ms -> ${(loops.js / loops.wasm).toFixed(2)} x`);
  console.log(`  ngspice (one process, ${2 * NETS} decks, TMAX = same step, no output), best of the same ${PASSES} rounds: CPU ${theirs.cpu.toFixed(3)} s, wall ${theirs.wall.toFixed(3)} s`);
  console.log(`  ratio: ${result.cpuRatio.toFixed(1)} x ngspice in CPU time, ${result.wallRatio.toFixed(1)} x in wall time (target 60 x) -> ${result.cpuRatio >= 60 ? 'meets' : 'MISSES'} it`);
  console.log(`  accuracy on all ${NETS} nets, both edges, against ngspice at TMAX 1 ps (deviation / swing, worst and 95th percentile):` +
    ` this solver ${pct(worst(solverDevs))} / ${pct(p95(solverDevs))}, ngspice at the benchmarked TMAX ${pct(worst(spiceDevs))} / ${pct(p95(spiceDevs))} (limit 1 %)`);
  return result;
}

let accuracyStats: { solver: number[]; spice: number[] } | null = null;

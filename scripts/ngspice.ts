/**
 * Writes a circuit as an ngspice deck (lossless T element, PWL source, R, C, L) and runs ngspice in
 * batch mode (`ngspice -b`), reading the waveforms back from `wrdata`. Development tooling shared by
 * the comparison tests (tests/ngspice, which also re-exports it as tests/ngspice/spice.ts) and the
 * solver benchmark (bench/solver.bench.ts), so neither depends on the other. ngspice is the Debian
 * package; it is required (no skip).
 */
import { execFileSync } from 'node:child_process';
import { mkdtempSync, readFileSync, rmSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import type { Circuit } from '../core/circuit/types.js';
import { GROUND } from '../core/circuit/types.js';
import { type Edge, rampStart } from '../core/solver/transient.js';
import { compileNetlist } from '../core/solver/netlist.js';
import { solveDc } from '../core/solver/dc.js';

export interface SpiceRun {
  t: Float64Array;
  v: Record<string, Float64Array>;
}

export interface DeckOptions {
  stop: number;
  /** Largest internal step ngspice may take (TMAX), s. */
  tmax: number;
  /** Write waveforms with wrdata to this file (omit in the benchmark to time the simulation only). */
  output?: string;
  /** Include the .control block that runs the analysis (default true); false for decks `source`d by a master script. */
  control?: boolean;
}

/** Maps circuit node names to SPICE node names (n0, n1, ...; ground is 0). */
export function spiceNodes(circuit: Circuit): Map<string, string> {
  const map = new Map<string, string>([[GROUND, '0']]);
  const add = (n: string) => {
    if (!map.has(n)) map.set(n, `n${map.size}`);
  };
  add(circuit.driver.node);
  for (const e of circuit.elements) {
    add(e.a);
    if (e.kind !== 'via') add(e.b);
  }
  for (const rail of Object.keys(circuit.rails)) add(rail);
  return map;
}

const num = (x: number) => x.toExponential(12);

/**
 * Breakpoint control of ngspice's lossless line (its REL and ABS parameters). With the defaults, nets
 * with many reflecting junctions made ngspice 39 cut its step to almost nothing (a fly-by net did not
 * finish in 60 s; ngspice run); 10 keeps it finishing in well under a second, and accuracy is then held
 * by the small TMAX instead.
 */
const REL_ABS = 10;

/**
 * The deck for one edge. The driver is a PWL ramp (full ramp = 10-90 % time / 0.8) behind its output
 * resistance; ngspice's DC operating point at t = 0 uses the PWL value at 0, the other level, as the
 * solver does. When the resistance changes with the level (routHigh ≠ routLow) the resistor is the new
 * level's and the PWL starts at the solver's ramp start v0' = Vpin + (v0 − Vpin)·Rnew/Rold (rampStart;
 * Vpin from the solver's DC point — ngspice then solves its own DC operating point from v0').
 */
export function spiceDeck(circuit: Circuit, edge: Edge, options: DeckOptions, title = 'slackline comparison'): string {
  const d = circuit.driver;
  const nodes = spiceNodes(circuit);
  const N = (n: string) => nodes.get(n)!;
  const rising = edge === 'rising';
  const [v0, v1] = rising ? [d.vlow, d.vhigh] : [d.vhigh, d.vlow];
  const [rOld, rNew] = rising ? [d.routLow, d.routHigh] : [d.routHigh, d.routLow];
  const ramp = (rising ? d.riseTime : d.fallTime) / 0.8;
  const lines = [`* ${title} (${edge})`];
  // Same ramp start as the solver when the resistance changes with the level (see rampStart).
  const net = compileNetlist(circuit);
  const start = rampStart(solveDc(net, v0, rOld).v[net.driver], v0, rOld, rNew);
  lines.push(`Vdrv src 0 PWL(0 ${num(start)} ${num(Math.max(ramp, 1e-15))} ${num(v1)} ${num(options.stop * 2)} ${num(v1)})`);
  lines.push(`Rdrv src ${N(d.node)} ${num(rNew)}`);
  Object.entries(circuit.rails).forEach(([rail, volts], i) => lines.push(`Vrail${i} ${N(rail)} 0 DC ${num(volts)}`));
  circuit.elements.forEach((e, i) => {
    switch (e.kind) {
      case 'line': lines.push(`T${i} ${N(e.a)} 0 ${N(e.b)} 0 Z0=${num(e.z0)} TD=${num(e.delay)} REL=${REL_ABS} ABS=${REL_ABS}`); break;
      case 'resistor': lines.push(`R${i} ${N(e.a)} ${N(e.b)} ${num(e.ohms)}`); break;
      case 'capacitor': lines.push(`C${i} ${N(e.a)} ${N(e.b)} ${num(e.farads)}`); break;
      case 'inductor': lines.push(`L${i} ${N(e.a)} ${N(e.b)} ${num(e.henries)}`); break;
      case 'via': lines.push(`C${i} ${N(e.a)} 0 ${num(e.farads)}`); break;
    }
  });
  circuit.receivers.forEach((r, i) => {
    if (r.cin > 0) lines.push(`Cin${i} ${N(r.node)} 0 ${num(r.cin)}`);
    if (r.odt) {
      lines.push(`Rodt${i} ${N(r.node)} odt${i} ${num(r.odt.ohms)}`);
      lines.push(`Vodt${i} odt${i} 0 DC ${num(r.odt.vtt)}`);
    }
  });
  lines.push(`.tran ${num(options.tmax)} ${num(options.stop)} 0 ${num(options.tmax)}`);
  if (options.control !== false) {
    lines.push('.control', 'set noaskquit', 'run');
    if (options.output) {
      const probes = [...nodes.entries()].filter(([n]) => n !== GROUND && !(n in circuit.rails)).map(([, s]) => `v(${s})`);
      lines.push('set wr_singlescale', 'set wr_vecnames', `wrdata ${options.output} ${probes.join(' ')}`);
    }
    lines.push('quit', '.endc');
  }
  lines.push('.end', '');
  return lines.join('\n');
}

/** Runs one edge in ngspice and returns its waveforms per circuit node. Throws if ngspice fails. */
export function runNgspice(circuit: Circuit, edge: Edge, options: Omit<DeckOptions, 'output'>): SpiceRun {
  const dir = mkdtempSync(join(tmpdir(), 'slackline-spice-'));
  try {
    const out = join(dir, 'out.txt');
    const deck = join(dir, 'deck.cir');
    writeFileSync(deck, spiceDeck(circuit, edge, { ...options, output: out }));
    execFileSync('ngspice', ['-b', deck], { stdio: ['ignore', 'pipe', 'pipe'], timeout: 120_000 });
    return parseWrdata(readFileSync(out, 'utf8'), circuit);
  } finally {
    rmSync(dir, { recursive: true, force: true });
  }
}

/** Parses `wrdata` output written with wr_singlescale and wr_vecnames. */
export function parseWrdata(text: string, circuit: Circuit): SpiceRun {
  const rows = text.trim().split('\n');
  const header = rows[0].trim().split(/\s+/);
  const data = rows.slice(1).map((r) => r.trim().split(/\s+/).map(Number));
  const byName = new Map([...spiceNodes(circuit)].map(([n, s]) => [`v(${s})`, n]));
  // ngspice may repeat a time point at breakpoints; keep the later sample of equal times.
  const keep = data.filter((row, i) => i + 1 >= data.length || data[i + 1][0] > row[0]);
  const t = Float64Array.from(keep, (r) => r[0]);
  const v: Record<string, Float64Array> = {};
  header.slice(1).forEach((name, c) => {
    const node = byName.get(name.toLowerCase()) ?? name;
    v[node] = Float64Array.from(keep, (r) => r[c + 1]);
  });
  return { t, v };
}

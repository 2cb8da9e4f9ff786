/**
 * The ngspice emulation of a net with IBIS buffers (docs/ibis.md §4, written independently of the
 * solver's pad code): every pad is a B-source current I = Ku·pwl(Vpu − V) + Kd·pwl(V − Vpd) +
 * pwl(V − Vgc) + pwl(Vpc − V) from the pad to ground (pwl() of a voltage: the V-I tables, extended
 * along their end segments, as ngspice's pwl does), Ku and Kd as PWL voltage sources of time (held at
 * their end values), C_comp as a capacitor; lines, R, C, L and rails as in scripts/ngspice.ts.
 */
import { execFileSync } from 'node:child_process';
import { mkdtempSync, readFileSync, rmSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import type { Circuit, Edge, PadCurve, PadTables } from '../../core/circuit/types.js';
import { GROUND } from '../../core/circuit/types.js';
import { parseWrdata, type SpiceRun, spiceNodes } from './spice.js';

const num = (x: number) => x.toExponential(10);
/** Same line breakpoint control as the linear comparison (scripts/ngspice.ts). */
const REL_ABS = 10;

/** pwl(arg, x0, y0, ...) text of a V-I curve, split over continuation lines. */
function pwl(arg: string, c: PadCurve): string {
  const pairs: string[] = [];
  for (let k = 0; k < c.v.length; k++) pairs.push(`${num(c.v[k])},${num(c.i[k])}`);
  const rows: string[] = [];
  for (let k = 0; k < pairs.length; k += 6) rows.push(pairs.slice(k, k + 6).join(','));
  return `pwl(${arg},\n+ ${rows.join(',\n+ ')})`;
}

function padSource(name: string, node: string, t: PadTables, ku: string | null, kd: string | null): string[] {
  const v = `v(${node})`;
  const terms: string[] = [];
  if (t.pullup && ku) terms.push(`v(${ku})*${pwl(`${num(t.pullupRef)}-${v}`, t.pullup)}`);
  if (t.pulldown && kd) terms.push(`v(${kd})*${pwl(`${v}-${num(t.pulldownRef)}`, t.pulldown)}`);
  if (t.gndClamp) terms.push(pwl(`${v}-${num(t.gndClampRef)}`, t.gndClamp));
  if (t.powerClamp) terms.push(pwl(`${num(t.powerClampRef)}-${v}`, t.powerClamp));
  const out = [`B${name} ${node} 0 I = ${terms.length ? terms.join('\n+ + ') : '0'}`];
  if (t.cComp > 0) out.push(`Ccomp${name} ${node} 0 ${num(t.cComp)}`);
  return out;
}

function timePwl(name: string, t: Float64Array, y: Float64Array, stop: number): string {
  const pairs: string[] = [];
  for (let k = 0; k < t.length; k++) pairs.push(`${num(t[k])} ${num(y[k])}`);
  if (t[t.length - 1] < stop * 2) pairs.push(`${num(stop * 2)} ${num(y[y.length - 1])}`);
  const rows: string[] = [];
  for (let k = 0; k < pairs.length; k += 6) rows.push(pairs.slice(k, k + 6).join(' '));
  return `V${name} ${name} 0 PWL(${rows.join('\n+ ')})`;
}

/** The deck for one edge of a circuit whose driver is an IBIS pad (receivers may be IBIS or linear). */
export function ibisDeck(circuit: Circuit, edge: Edge, options: { stop: number; tmax: number; output: string }): string {
  const d = circuit.driver;
  if (!d.pad) throw new Error('ibisDeck: the driver is not an IBIS pad');
  const nodes = spiceNodes(circuit);
  const N = (n: string) => nodes.get(n)!;
  const lines = [`* slackline IBIS comparison (${edge})`];
  const sw = d.pad[edge];
  lines.push(timePwl('ku', sw.t, sw.ku, options.stop), timePwl('kd', sw.t, sw.kd, options.stop));
  lines.push(...padSource('drv', N(d.node), d.pad, 'ku', 'kd'));
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
    if (r.odt) lines.push(`Rodt${i} ${N(r.node)} odt${i} ${num(r.odt.ohms)}`, `Vodt${i} odt${i} 0 DC ${num(r.odt.vtt)}`);
    if (r.pad) lines.push(...padSource(`rx${i}`, N(r.node), r.pad, null, null));
  });
  lines.push(`.tran ${num(options.tmax)} ${num(options.stop)} 0 ${num(options.tmax)}`);
  const probes = [...nodes.entries()].filter(([n]) => n !== GROUND && !(n in circuit.rails)).map(([, s]) => `v(${s})`);
  lines.push('.control', 'set noaskquit', 'run', 'set wr_singlescale', 'set wr_vecnames', `wrdata ${options.output} ${probes.join(' ')}`, 'quit', '.endc', '.end', '');
  return lines.join('\n');
}

/** Runs one edge of an IBIS net in ngspice. Throws if ngspice fails. */
export function runIbisNgspice(circuit: Circuit, edge: Edge, options: { stop: number; tmax: number }): SpiceRun {
  const dir = mkdtempSync(join(tmpdir(), 'slackline-ibis-spice-'));
  try {
    const out = join(dir, 'out.txt');
    const deck = join(dir, 'deck.cir');
    writeFileSync(deck, ibisDeck(circuit, edge, { ...options, output: out }));
    execFileSync('ngspice', ['-b', deck], { stdio: ['ignore', 'pipe', 'pipe'], timeout: 180_000 });
    return parseWrdata(readFileSync(out, 'utf8'), circuit);
  } finally {
    rmSync(dir, { recursive: true, force: true });
  }
}

/**
 * Board generator for the board-scale benchmarks and tests: an invented board of any number of nets,
 * built from the demo project's stackup, parts, corners and bus patterns (fixtures/demo), repeated in
 * slices with every net renamed and its routed lengths varied by a seeded generator. It keeps every
 * kind of net the demo has (on the demo's linear part models unless asked for its IBIS models):
 * source-synchronous byte lanes (strobe + data), a fly-by address/command bus with its clock and end
 * termination, and a common-clock local bus with series resistors; the demo's deliberately failing and
 * tight nets are repeated with it, so a check of the board fails.
 * Deterministic: the same (nets, seed) gives the same project.
 */
import type { BusDefinition, NetDefinition, NetElement, ProjectData } from '../core/project/model.js';
import { buildDemoProject, buildLinearDemoProject } from '../fixtures/demo/demo-project.js';
import { mulberry32 } from '../scripts/prng.js';

const prng = mulberry32;

/** Lengths of each slice's nets vary by at most this fraction (±), so slices are not copies. */
const LENGTH_SPREAD = 0.02;

/**
 * Which part models the board copies: the demo's linear driver and receiver models (`linear`, the
 * default: the board the board-scale measurements were first taken on, before the demo's memory parts
 * moved to IBIS models) or the demo as it ships, IBIS models for its memory parts (`ibis`).
 */
export type GeneratedModels = 'linear' | 'ibis';

/**
 * A board of exactly `nets` nets (at least 2). Whole buses of the demo are taken slice after slice;
 * the last bus is cut short (its reference net always kept), so the count comes out exact.
 */
export function generateBoard(nets: number, seed = 1, options: { models?: GeneratedModels } = {}): ProjectData {
  if (!(Number.isInteger(nets) && nets >= 2)) throw new Error(`generateBoard: nets must be a whole number >= 2, got ${nets}`);
  const demo = (options.models ?? 'linear') === 'ibis' ? buildDemoProject() : buildLinearDemoProject();
  const random = prng(seed);
  const buses: BusDefinition[] = [];
  const out: NetDefinition[] = [];
  for (let slice = 0; out.length < nets; slice++) {
    const suffix = slice === 0 ? '' : `_S${slice}`;
    for (const bus of demo.buses) {
      if (out.length >= nets) break;
      const members = demo.nets.filter((n) => n.bus === bus.name);
      // the reference net first, so a cut-short bus keeps its strobe or clock
      members.sort((a, b) => Number(b.name === bus.referenceNet) - Number(a.name === bus.referenceNet));
      const room = nets - out.length;
      if (room === 1 && members.length > 1 && bus.referenceNet) {
        // one net left: a lone data net would have no strobe; add it to the previous bus instead
        const last = out[out.length - 1];
        out.push(renamed(members.find((n) => n.name !== bus.referenceNet)!, `${suffix}_X`, last.bus, random));
        break;
      }
      const taken = members.slice(0, room);
      const name = `${bus.name}${suffix}`;
      buses.push({ ...bus, name, referenceNet: bus.referenceNet ? `${bus.referenceNet}${suffix}` : bus.referenceNet });
      for (const net of taken) out.push(renamed(net, suffix, name, random));
    }
  }
  return {
    ...demo,
    info: { ...demo.info, name: `Generated board, ${nets} nets (invented for the benchmarks)` },
    buses,
    nets: out,
  };
}

function renamed(net: NetDefinition, suffix: string, bus: string, random: () => number): NetDefinition {
  const scale = 1 + LENGTH_SPREAD * (2 * random() - 1);
  const elements: NetElement[] = net.elements.map((e) => (e.kind === 'segment' ? { ...e, length: e.length * scale } : { ...e }));
  return { ...net, name: `${net.name}${suffix}`, bus, elements, receivers: net.receivers.map((r) => ({ ...r })), rails: { ...net.rails } };
}

/** A one-net edit: the first segment of net `index` gets `delta` metres longer (a new project object). */
export function editOneNet(project: ProjectData, index: number, delta: number): ProjectData {
  const nets = project.nets.map((n, i) => {
    if (i !== index) return n;
    const at = n.elements.findIndex((e) => e.kind === 'segment');
    return { ...n, elements: n.elements.map((e, k) => (k === at && e.kind === 'segment' ? { ...e, length: e.length + delta } : e)) };
  });
  return { ...project, nets };
}

/** Finding a net's bus, strobe and kind in a project; errors name the net or bus. */
import { InputError } from '../errors.js';
import type { BusDefinition, NetDefinition, ProjectData } from '../project/model.js';

/**
 * Three kinds of net (docs/design.md §6):
 * - timed nets (data, address, command, control): budget against the bus's timing;
 * - the strobe of a source-synchronous bus: its margins are the worst its data nets get from it;
 * - other clock/strobe nets: signal quality only.
 */
export type NetKind = 'timed' | 'strobe' | 'quality-only';

export function busOf(project: ProjectData, net: NetDefinition): BusDefinition {
  const bus = project.buses.find((b) => b.name === net.bus);
  if (!bus) throw new InputError(`net ${net.name}`, `bus "${net.bus}" is not in the project`);
  return bus;
}

/**
 * Nets by name, per net list (built once per loaded project, so a board solve looks up in O(1)).
 * Projects are treated as values (edits build new lists); a list whose length or entries changed
 * under the index is re-indexed.
 */
const netIndex = new WeakMap<readonly NetDefinition[], Map<string, NetDefinition>>();

export function findNet(project: ProjectData, name: string): NetDefinition {
  let index = netIndex.get(project.nets);
  if (!index || index.size !== project.nets.length) {
    index = new Map(project.nets.map((n) => [n.name, n]));
    netIndex.set(project.nets, index);
  }
  let net = index.get(name);
  if (net && net.name !== name) {
    netIndex.delete(project.nets);
    return findNet(project, name);
  }
  if (!net) net = project.nets.find((n) => n.name === name); // a list changed in place since indexing
  if (!net) throw new InputError(`net ${name}`, 'not in the project');
  return net;
}

/** The bus's strobe net when the bus is source-synchronous, else null. Throws when it is missing. */
export function strobeOf(project: ProjectData, bus: BusDefinition): NetDefinition | null {
  if (bus.timing.kind !== 'source-synchronous') return null;
  if (!bus.referenceNet) throw new InputError(`bus ${bus.name}`, 'a source-synchronous bus needs a strobe (reference net)');
  const strobe = project.nets.find((n) => n.name === bus.referenceNet);
  if (!strobe) throw new InputError(`bus ${bus.name}`, `strobe net "${bus.referenceNet}" is not in the project`);
  return strobe;
}

export function netKind(project: ProjectData, net: NetDefinition): NetKind {
  const bus = busOf(project, net);
  if (bus.timing.kind === 'source-synchronous' && bus.referenceNet === net.name) return 'strobe';
  if (net.role === 'strobe' || net.role === 'clock' || bus.referenceNet === net.name) return 'quality-only';
  return 'timed';
}

/**
 * The bus's clock net when the bus is common-clock and names one (docs/design.md §6.1: its simulated
 * launch and flights enter every receiver's budget), else null. Throws when the named net is missing.
 */
export function clockOf(project: ProjectData, bus: BusDefinition): NetDefinition | null {
  if (bus.timing.kind !== 'common-clock' || !bus.referenceNet) return null;
  const clock = project.nets.find((n) => n.name === bus.referenceNet);
  if (!clock) throw new InputError(`bus ${bus.name}`, `clock net "${bus.referenceNet}" is not in the project`);
  return clock;
}

/** The net whose measures a bus's timed nets need: its strobe or its clock net (null when none). */
export function referenceOf(project: ProjectData, bus: BusDefinition): NetDefinition | null {
  return strobeOf(project, bus) ?? clockOf(project, bus);
}

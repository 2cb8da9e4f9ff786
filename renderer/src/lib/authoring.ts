/**
 * Shapes the workbench's authoring forms send (docs/design-file.md §9): a new bus with its timing, a
 * new net that takes its bus's topology, a part copied under a new name. Pure; the services validate.
 */
import type { BusDefinition, BusKind, NetDefinition, NetElement, NetRole, PartModel } from '../../../core/project/model.js';

/** A bus with no nets yet: common clock at `period`, or source synchronous valid `period`/4 either side of the strobe. */
export function newBus(name: string, kind: BusKind, period: number, description = ''): BusDefinition {
  return {
    name: name.trim(), kind, description, referenceNet: null, allowances: [],
    timing: kind === 'common-clock'
      ? { kind, cycleTime: period, clockSkew: 0, jitter: 0 }
      : { kind, tValidBefore: period / 4, tValidAfter: period / 4 },
  };
}

/**
 * The bus's template as the workbench sees it: the topology of one of its nets (the first that is
 * not the clock or strobe), else of `fallback` (a net picked from another bus for an empty bus).
 */
export function templateNetOf(bus: BusDefinition, nets: readonly NetDefinition[], fallback: string | null): NetDefinition | null {
  const members = nets.filter((n) => n.bus === bus.name);
  return members.find((n) => n.name !== bus.referenceNet) ?? members[0] ?? nets.find((n) => n.name === fallback) ?? null;
}

/** A new net of `bus` with the driver, receivers, rails and elements of `shape` (copied, not shared). */
export function netFromTemplate(name: string, role: NetRole, bus: string, shape: NetDefinition): NetDefinition {
  return {
    name: name.trim(), bus, role,
    driver: { ...shape.driver },
    receivers: shape.receivers.map((r) => ({ ...r })),
    rails: { ...shape.rails },
    elements: shape.elements.map((e) => ({ ...e })),
  };
}

/** A copy of `part` under a new name, to be edited in the parts view. */
export function copyOfPart(name: string, part: PartModel): PartModel {
  return structuredClone({ ...part, name: name.trim() });
}

/** Every node of a net's topology (where a via or a termination can go), driver first. */
export function nodesOf(net: NetDefinition): string[] {
  const seen = new Set<string>([net.driver.node]);
  for (const e of net.elements) {
    seen.add(e.a);
    if (e.kind !== 'via') seen.add(e.b);
  }
  for (const r of net.receivers) seen.add(r.node);
  return [...seen].filter((n) => n !== 'gnd' && !(n in net.rails));
}

/** One line for an element, as the element editor and the structure list show it. */
export function elementLabel(element: NetElement): string {
  switch (element.kind) {
    case 'segment': return `trace on ${element.layer}, ${element.a} → ${element.b}`;
    case 'line': return `line Z0 ${element.z0.toFixed(1)} Ω, ${element.a} → ${element.b}`;
    case 'resistor': return `resistor ${element.a} → ${element.b}`;
    case 'capacitor': return `capacitor ${element.a} → ${element.b}`;
    case 'inductor': return `inductor ${element.a} → ${element.b}`;
    case 'via': return `via at ${element.a}`;
  }
}

/** The net to offer as the topology of a new net on an empty bus: a data net that times against none of the buses, else any. */
export function defaultTemplateNet(buses: readonly BusDefinition[], nets: readonly NetDefinition[]): string | null {
  const references = new Set(buses.map((b) => b.referenceNet));
  return (nets.find((n) => n.role === 'data' && !references.has(n.name)) ?? nets[0])?.name ?? null;
}

/** The receiver node the wave reaches last: the end where an end termination goes by default. */
export function farEndNode(net: NetDefinition): string {
  return net.receivers[net.receivers.length - 1]?.node ?? net.driver.node;
}

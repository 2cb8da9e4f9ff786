/**
 * Authoring edits as pure functions: project in, changed project and one line for the change log out
 * (docs/design-file.md §9). Each refuses with the place named: deleting something others refer to
 * names the referrers; the caller validates the whole result and writes it in one transaction.
 */
import { InputError, require_ } from '../errors.js';
import type { BusDefinition, NetDefinition, NetElement, PartModel, ProjectData, Waiver } from '../project/model.js';
import { formatIssue, readDesignText, type DesignIssue } from './located.js';
import { checkJsonSchema } from './json-schema.js';
import { DESIGN_SCHEMA } from './schema.js';
import { expandTemplate } from './template.js';
import { readQuantity } from './quantities.js';

export interface Edited {
  project: ProjectData;
  /** One line for the change log, e.g. "renamed bus DATA to LANE0 (9 nets moved)". */
  detail: string;
}

const list = (names: readonly string[], limit = 8): string =>
  names.length <= limit ? names.join(', ') : `${names.slice(0, limit).join(', ')} and ${names.length - limit} more`;

function netOf(p: ProjectData, name: string): NetDefinition {
  const net = p.nets.find((n) => n.name === name);
  require_(net !== undefined, `net ${name}`, 'is not in the project');
  return net;
}

function requireFree(names: readonly string[], name: string, what: string): void {
  require_(name.trim().length > 0, `${what} name`, 'must not be empty');
  require_(!names.includes(name), `${what} ${name}`, 'the name is already used');
}

// ---------------------------------------------------------------- buses

export function createBus(p: ProjectData, bus: BusDefinition): Edited {
  requireFree(p.buses.map((b) => b.name), bus.name, 'bus');
  return { project: { ...p, buses: [...p.buses, bus] }, detail: `added bus ${bus.name}` };
}

export function renameBus(p: ProjectData, from: string, to: string): Edited {
  require_(p.buses.some((b) => b.name === from), `bus ${from}`, 'is not in the project');
  requireFree(p.buses.map((b) => b.name), to, 'bus');
  const moved = p.nets.filter((n) => n.bus === from).length;
  return {
    project: {
      ...p,
      buses: p.buses.map((b) => (b.name === from ? { ...b, name: to } : b)),
      nets: p.nets.map((n) => (n.bus === from ? { ...n, bus: to } : n)),
    },
    detail: `renamed bus ${from} to ${to} (${moved} net${moved === 1 ? '' : 's'} follow)`,
  };
}

export function deleteBus(p: ProjectData, name: string): Edited {
  require_(p.buses.some((b) => b.name === name), `bus ${name}`, 'is not in the project');
  const members = p.nets.filter((n) => n.bus === name).map((n) => n.name);
  require_(members.length === 0, `bus ${name}`, `still has nets ${list(members)}: delete them or move them to another bus first`);
  return { project: { ...p, buses: p.buses.filter((b) => b.name !== name) }, detail: `deleted bus ${name}` };
}

// ---------------------------------------------------------------- nets

export function createNet(p: ProjectData, net: NetDefinition): Edited {
  requireFree(p.nets.map((n) => n.name), net.name, 'net');
  require_(p.buses.some((b) => b.name === net.bus), `net ${net.name}`, `bus "${net.bus}" is not in the project`);
  return { project: { ...p, nets: [...p.nets, net] }, detail: `added net ${net.name} to bus ${net.bus}` };
}

export function renameNet(p: ProjectData, from: string, to: string): Edited {
  netOf(p, from);
  requireFree(p.nets.map((n) => n.name), to, 'net');
  const referring = p.buses.filter((b) => b.referenceNet === from).map((b) => b.name);
  const waived = (p.waivers ?? []).some((w) => w.net === from);
  return {
    project: {
      ...p,
      nets: p.nets.map((n) => (n.name === from ? { ...n, name: to } : n)),
      buses: p.buses.map((b) => (b.referenceNet === from ? { ...b, referenceNet: to } : b)),
      // The waiver follows its net, as the bus reference does (docs/workbench.md, "Waivers").
      ...(p.waivers ? { waivers: p.waivers.map((w) => (w.net === from ? { ...w, net: to } : w)) } : {}),
    },
    detail: `renamed net ${from} to ${to}${referring.length ? ` (reference net of ${list(referring)})` : ''}${waived ? ' (its waiver follows)' : ''}`,
  };
}

export function deleteNet(p: ProjectData, name: string): Edited {
  netOf(p, name);
  const referring = p.buses.filter((b) => b.referenceNet === name).map((b) => b.name);
  require_(referring.length === 0, `net ${name}`, `is the clock or strobe of bus ${list(referring)}: choose another reference net there first`);
  // A waiver belongs to its net alone: it goes with it, and the change-log line says so (undo restores both).
  const waiver = (p.waivers ?? []).find((w) => w.net === name);
  return {
    project: { ...withoutWaiver(p, name), nets: p.nets.filter((n) => n.name !== name) },
    detail: `deleted net ${name}${waiver ? ` and its waiver (by ${waiver.author})` : ''}`,
  };
}

// ---------------------------------------------------------------- waivers (docs/workbench.md, "Waivers")

function withoutWaiver(p: ProjectData, net: string): ProjectData {
  if (!p.waivers) return p;
  const waivers = p.waivers.filter((w) => w.net !== net);
  const { waivers: _dropped, ...rest } = p;
  return waivers.length > 0 ? { ...rest, waivers } : rest;
}

/**
 * Records a reviewer's waiver of a net (replacing one it had). Comment and author are required; what
 * is waived (check, status, margin) comes from the net's result, worked out by the caller.
 */
export function setWaiver(p: ProjectData, waiver: Waiver): Edited {
  netOf(p, waiver.net);
  require_(waiver.comment.trim().length > 0, `waiver of net ${waiver.net} comment`, 'is required: say why the net is accepted as it is');
  require_(waiver.author.trim().length > 0, `waiver of net ${waiver.net} author`, 'is required: say who accepts it');
  const had = (p.waivers ?? []).some((w) => w.net === waiver.net);
  const clean: Waiver = { ...waiver, comment: waiver.comment.trim(), author: waiver.author.trim() };
  return {
    project: { ...p, waivers: [...(p.waivers ?? []).filter((w) => w.net !== waiver.net), clean] },
    detail: `${had ? 'renewed the waiver of' : 'waived'} net ${waiver.net} (${waiver.status} ${waiver.check}) by ${clean.author}: ${clean.comment}`,
  };
}

export function removeWaiver(p: ProjectData, net: string): Edited {
  netOf(p, net);
  const waiver = (p.waivers ?? []).find((w) => w.net === net);
  require_(waiver !== undefined, `net ${net}`, 'has no waiver');
  return { project: withoutWaiver(p, net), detail: `removed the waiver of net ${net} (by ${waiver.author})` };
}

// ---------------------------------------------------------------- parts

export function createPart(p: ProjectData, part: PartModel): Edited {
  requireFree(p.parts.map((x) => x.name), part.name, 'part');
  return { project: { ...p, parts: [...p.parts, part] }, detail: `added part ${part.name}` };
}

/** Nets whose driver or a receiver uses the part. */
export function partUsers(p: ProjectData, part: string): string[] {
  return p.nets.filter((n) => n.driver.part === part || n.receivers.some((r) => r.part === part)).map((n) => n.name);
}

export function renamePart(p: ProjectData, from: string, to: string): Edited {
  require_(p.parts.some((x) => x.name === from), `part ${from}`, 'is not in the project');
  requireFree(p.parts.map((x) => x.name), to, 'part');
  const users = partUsers(p, from);
  const rename = <T extends { part: string }>(e: T): T => (e.part === from ? { ...e, part: to } : e);
  return {
    project: {
      ...p,
      parts: p.parts.map((x) => (x.name === from ? { ...x, name: to } : x)),
      nets: p.nets.map((n) => ({ ...n, driver: rename(n.driver), receivers: n.receivers.map(rename) })),
    },
    detail: `renamed part ${from} to ${to} (${users.length} net${users.length === 1 ? '' : 's'} follow)`,
  };
}

export function deletePart(p: ProjectData, name: string): Edited {
  require_(p.parts.some((x) => x.name === name), `part ${name}`, 'is not in the project');
  const users = partUsers(p, name);
  require_(users.length === 0, `part ${name}`, `is used by nets ${list(users)}: change their driver or receivers first`);
  return { project: { ...p, parts: p.parts.filter((x) => x.name !== name) }, detail: `deleted part ${name}` };
}

/**
 * Sets or clears the IBIS model of a part (docs/ibis.md §9): `ibis` names a stored file and a [Model]
 * in it, null returns the part to its linear driver and receiver (the linear fields are kept either
 * way). The file must be stored; that the model is in it is checked with the whole project by the store.
 */
export function setPartIbis(p: ProjectData, partName: string, ibis: { file: string; model: string; pin?: string } | null): Edited {
  const part = p.parts.find((x) => x.name === partName);
  require_(part !== undefined, `part ${partName}`, 'is not in the project');
  if (ibis) {
    const files = (p.ibisFiles ?? []).map((f) => f.name);
    require_(files.includes(ibis.file), `part ${partName} ibis.file`,
      `IBIS file "${ibis.file}" is not in the project (${files.length ? `stored: ${list(files)}` : 'none stored'}; import it first)`);
  }
  const { ibis: before, ...rest } = part;
  const changed: PartModel = ibis ? { ...rest, ibis: ibis.pin ? { file: ibis.file, model: ibis.model, pin: ibis.pin } : { file: ibis.file, model: ibis.model } } : rest;
  const words = (x: { file: string; model: string; pin?: string }) => `${x.model} (${x.file}${x.pin ? `, pin ${x.pin}` : ''})`;
  const was = before ? words(before) : 'linear';
  const now = ibis ? words(ibis) : 'linear';
  return {
    project: { ...p, parts: p.parts.map((x) => (x.name === partName ? changed : x)) },
    detail: `part ${partName} buffer model: ${was} -> ${now}`,
  };
}

// ---------------------------------------------------------------- structural net edits

function withNet(p: ProjectData, net: NetDefinition): ProjectData {
  return { ...p, nets: p.nets.map((n) => (n.name === net.name ? net : n)) };
}

/** Inserts `element` before position `index` (0-based; index = length appends). */
export function insertNetElement(p: ProjectData, netName: string, index: number, element: NetElement): Edited {
  const net = netOf(p, netName);
  require_(Number.isInteger(index) && index >= 0 && index <= net.elements.length, `net ${netName} element ${index + 1}`,
    `no such position (the net has ${net.elements.length} elements; insert at 1 to ${net.elements.length + 1})`);
  const elements = [...net.elements.slice(0, index), element, ...net.elements.slice(index)];
  return { project: withNet(p, { ...net, elements }), detail: `net ${netName}: inserted ${element.kind} as element ${index + 1}` };
}

export function removeNetElement(p: ProjectData, netName: string, index: number): Edited {
  const net = netOf(p, netName);
  require_(Number.isInteger(index) && index >= 0 && index < net.elements.length, `net ${netName} element ${index + 1}`,
    `no such element (the net has ${net.elements.length})`);
  const removed = net.elements[index];
  const elements = net.elements.filter((_, i) => i !== index);
  const nodes = new Set(elements.flatMap((e) => (e.kind === 'via' ? [e.a] : [e.a, e.b])));
  const stranded = [net.driver, ...net.receivers].filter((e) => elements.length > 0 && !nodes.has(e.node)).map((e) => e.designator);
  require_(stranded.length === 0, `net ${netName} element ${index + 1}`, `removing it leaves ${list(stranded)} on no element`);
  return { project: withNet(p, { ...net, elements }), detail: `net ${netName}: removed element ${index + 1} (${removed.kind})` };
}

/**
 * A termination as the check suggests it (core/engine/termination.ts): a series resistor at the
 * driver pin (the pin moves to a new node behind it) or a resistor from `node` to a rail at `vtt`.
 */
export type TerminationChange =
  | { kind: 'series'; ohms: number }
  | { kind: 'parallel-end'; ohms: number; node: string; vtt: number };

const unused = (taken: ReadonlySet<string>, base: string): string => {
  let name = base;
  for (let i = 2; taken.has(name); i += 1) name = `${base}${i}`;
  return name;
};

export function applyTermination(p: ProjectData, netName: string, change: TerminationChange): Edited {
  const net = netOf(p, netName);
  const nodes = new Set([...net.elements.flatMap((e) => (e.kind === 'via' ? [e.a] : [e.a, e.b])), ...Object.keys(net.rails), 'gnd']);
  if (change.kind === 'series') {
    const pin = unused(nodes, `${net.driver.node}_pin`);
    const next: NetDefinition = {
      ...net,
      driver: { ...net.driver, node: pin },
      elements: [{ kind: 'resistor', a: pin, b: net.driver.node, ohms: change.ohms }, ...net.elements],
    };
    return { project: withNet(p, next), detail: `net ${netName}: ${change.ohms} ohm series resistor at the driver ${net.driver.designator}` };
  }
  require_(nodes.has(change.node), `net ${netName}`, `node "${change.node}" is not in the net`);
  const rail = unused(new Set([...nodes, ...Object.keys(net.rails)]), 'vtt_end');
  const next: NetDefinition = {
    ...net,
    rails: { ...net.rails, [rail]: change.vtt },
    elements: [...net.elements, { kind: 'resistor', a: change.node, b: rail, ohms: change.ohms }],
  };
  return { project: withNet(p, next), detail: `net ${netName}: ${change.ohms} ohm end termination at node ${change.node} to ${change.vtt} V` };
}

/**
 * Gives every net of `bus` the topology of a design-file template (docs/design-file.md §5), given as
 * YAML text of the template map. Each net keeps its name and role; driver, receivers, rails and
 * elements come from the template. Every problem is listed with its line in the template text.
 */
export function applyBusTemplate(p: ProjectData, busName: string, templateYaml: string): Edited {
  require_(p.buses.some((b) => b.name === busName), `bus ${busName}`, 'is not in the project');
  const file = `template of bus ${busName}`;
  const located = readDesignText(file, templateYaml);
  if (located.syntaxErrors.length > 0) throw new InputError(`bus ${busName}`, `the template is not valid YAML:\n  ${located.syntaxErrors.join('\n  ')}`);
  const templateSchema = { ...(DESIGN_SCHEMA.$defs as Record<string, Record<string, unknown>>).template, $defs: DESIGN_SCHEMA.$defs };
  const issues: DesignIssue[] = checkJsonSchema(located.value, templateSchema);
  const template = (located.value ?? {}) as { driver?: { part?: string; designator?: string }; rails?: Record<string, unknown>; path?: unknown[] };
  const members = p.nets.filter((n) => n.bus === busName);
  require_(members.length > 0, `bus ${busName}`, 'has no nets to apply the template to');
  const layers = new Map(p.stackup.layers.map((l) => [l.name, l]));
  const rails: Record<string, number> = {};
  for (const [name, v] of Object.entries(template.rails ?? {})) {
    rails[name] = readQuantity(issues, v, 'voltage', ['rails', name]) ?? Number.NaN;
  }
  let expanded: ReturnType<typeof expandTemplate> | null = null;
  if (issues.length === 0) {
    expanded = expandTemplate(issues, {
      steps: template.path ?? [], stepsPath: ['path'],
      driver: { part: String(template.driver?.part ?? ''), designator: String(template.driver?.designator ?? '') },
      segments: [], segmentsPath: ['segments'], replacements: {}, replacementsPath: ['steps'],
      layers, rails: new Set(Object.keys(rails)),
    });
  }
  if (issues.length > 0 || !expanded) {
    throw new InputError(`bus ${busName}`, `the template has problems, nothing was changed:\n  ${issues.map((i) => formatIssue(located, i)).join('\n  ')}`);
  }
  const shape = expanded;
  const nets = p.nets.map((n) => (n.bus === busName
    ? { ...n, driver: { ...shape.driver }, receivers: shape.receivers.map((r) => ({ ...r })), rails: { ...rails }, elements: shape.elements.map((e) => ({ ...e })) }
    : n));
  return { project: { ...p, nets }, detail: `applied a template to the ${members.length} nets of bus ${busName}` };
}

// ---------------------------------------------------------------- one edit, by name (the service API)

/** An authoring edit as the service API carries it (core/contract/api.ts SlacklineApi.editProject). */
export type ProjectEdit =
  | { op: 'createBus'; bus: BusDefinition }
  | { op: 'renameBus'; from: string; to: string }
  | { op: 'deleteBus'; name: string }
  | { op: 'createNet'; net: NetDefinition }
  | { op: 'renameNet'; from: string; to: string }
  | { op: 'deleteNet'; name: string }
  | { op: 'createPart'; part: PartModel }
  | { op: 'renamePart'; from: string; to: string }
  | { op: 'deletePart'; name: string }
  | { op: 'setPartIbis'; part: string; ibis: { file: string; model: string; pin?: string } | null }
  | { op: 'insertNetElement'; net: string; index: number; element: NetElement }
  | { op: 'removeNetElement'; net: string; index: number }
  | { op: 'applyTermination'; net: string; change: TerminationChange }
  | { op: 'applyBusTemplate'; bus: string; template: string };

/** The change-log action of an edit, e.g. "create-bus". */
export const editAction = (edit: ProjectEdit): string => edit.op.replace(/[A-Z]/g, (c) => `-${c.toLowerCase()}`);

export function applyProjectEdit(p: ProjectData, edit: ProjectEdit): Edited {
  switch (edit.op) {
    case 'createBus': return createBus(p, edit.bus);
    case 'renameBus': return renameBus(p, edit.from, edit.to);
    case 'deleteBus': return deleteBus(p, edit.name);
    case 'createNet': return createNet(p, edit.net);
    case 'renameNet': return renameNet(p, edit.from, edit.to);
    case 'deleteNet': return deleteNet(p, edit.name);
    case 'createPart': return createPart(p, edit.part);
    case 'renamePart': return renamePart(p, edit.from, edit.to);
    case 'deletePart': return deletePart(p, edit.name);
    case 'setPartIbis': return setPartIbis(p, edit.part, edit.ibis);
    case 'insertNetElement': return insertNetElement(p, edit.net, edit.index, edit.element);
    case 'removeNetElement': return removeNetElement(p, edit.net, edit.index);
    case 'applyTermination': return applyTermination(p, edit.net, edit.change);
    case 'applyBusTemplate': return applyBusTemplate(p, edit.bus, edit.template);
  }
}

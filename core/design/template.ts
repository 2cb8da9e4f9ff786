/**
 * Topology templates: a bus's path of steps from the driver (trace, series R, via, drop, fly-by,
 * end termination...) expanded into one net's elements and receivers, with that net's overrides of
 * trace lengths, layers and widths and of labelled steps (docs/design-file.md §5).
 */
import type { NetElement, NetEndpoint, StackupLayer } from '../project/model.js';
import type { DesignIssue, FieldPath } from './located.js';
import { readQuantity } from './quantities.js';

type Obj = Record<string, unknown>;
const isObj = (v: unknown): v is Obj => typeof v === 'object' && v !== null && !Array.isArray(v);

export const STEP_KINDS = ['trace', 'series', 'inductor', 'line', 'via', 'cap', 'receiver', 'drop', 'flyby', 'terminate'] as const;
export type StepKind = (typeof STEP_KINDS)[number];

/** The node the driver's pin sits on in every expanded net. */
export const DRIVER_NODE = 'drv';

export interface ExpandInput {
  /** The template's steps and the path of its `path` list. */
  steps: readonly unknown[];
  stepsPath: FieldPath;
  driver: { part: string; designator: string; node?: string };
  /** The net's `segments` overrides and their path. */
  segments: readonly unknown[];
  segmentsPath: FieldPath;
  /** The net's `steps` replacements (label -> step or null) and their path. */
  replacements: Obj;
  replacementsPath: FieldPath;
  layers: ReadonlyMap<string, StackupLayer>;
  /** Rail names usable as termination targets ("gnd" always is). */
  rails: ReadonlySet<string>;
}

export interface Expanded {
  elements: NetElement[];
  driver: NetEndpoint;
  receivers: NetEndpoint[];
  /** Per element: the field path people should be sent to for it. */
  origins: FieldPath[];
  /** Per receiver: the path of its part name in the template (or the net's replacement step). */
  receiverOrigins: FieldPath[];
}

/** The single kind key of a step, or null (issue recorded). */
export function stepKind(issues: DesignIssue[], step: unknown, path: FieldPath): StepKind | null {
  if (!isObj(step)) return null; // the schema check reported it
  const kinds = STEP_KINDS.filter((k) => k in step);
  if (kinds.length !== 1) {
    issues.push({
      path,
      message: kinds.length === 0
        ? `a step needs one of ${STEP_KINDS.join(', ')}`
        : `a step has exactly one of ${STEP_KINDS.join(', ')}; this one has ${kinds.join(' and ')}`,
    });
    return null;
  }
  return kinds[0];
}

export function expandTemplate(issues: DesignIssue[], input: ExpandInput): Expanded {
  const elements: NetElement[] = [];
  const origins: FieldPath[] = [];
  const receivers: NetEndpoint[] = [];
  const receiverOrigins: FieldPath[] = [];
  let counter = 0;
  const fresh = (label: unknown): string => {
    if (typeof label === 'string' && label !== '') return label;
    counter += 1;
    return `n${counter}`;
  };
  let traceIndex = 0;
  const usedLabels = new Set<string>();

  const push = (element: NetElement, origin: FieldPath) => {
    elements.push(element);
    origins.push(origin);
  };

  /** One trace from `a` to a new node `b`, with the net's override for this trace. */
  const trace = (spec: unknown, specPath: FieldPath, a: string, b: string) => {
    const override = input.segments[traceIndex];
    const overridePath = [...input.segmentsPath, traceIndex];
    traceIndex += 1;
    if (!isObj(spec)) return;
    const o = isObj(override) ? override : {};
    const from = (key: string): [unknown, FieldPath] =>
      o[key] !== undefined ? [o[key], [...overridePath, key]] : [spec[key], [...specPath, key]];
    const [layerName, layerPath] = from('layer');
    if (typeof layerName !== 'string') return;
    const layer = input.layers.get(layerName);
    if (!layer) {
      issues.push({ path: layerPath, message: `layer "${layerName}" is not in the stackup (copper layers: ${[...input.layers.values()].filter((l) => l.kind === 'copper').map((l) => l.name).join(', ') || 'none'})` });
      return;
    }
    if (layer.kind !== 'copper') {
      issues.push({ path: layerPath, message: `layer "${layerName}" is a ${layer.kind} layer; traces run on copper layers` });
      return;
    }
    const [widthValue, widthPath] = from('width');
    let width: number | null;
    if (widthValue === undefined) {
      width = layer.defaultWidth ?? null;
      if (width === null) issues.push({ path: specPath, message: `needs a width: layer "${layerName}" has no defaultWidth` });
    } else {
      width = readQuantity(issues, widthValue, 'width', widthPath);
    }
    const [lengthValue, lengthPath] = from('length');
    const length = readQuantity(issues, lengthValue, 'length', lengthPath, 0);
    const [spacingValue, spacingPath] = from('spacing');
    const spacing = spacingValue === undefined ? undefined : readQuantity(issues, spacingValue, 'width', spacingPath);
    if (width === null || length === null || spacing === null) return;
    const element: NetElement = { kind: 'segment', a, b, layer: layerName, width, length };
    if (spacing !== undefined) element.spacing = spacing;
    push(element, o.length !== undefined ? overridePath : specPath);
  };

  const addReceiver = (spec: unknown, node: string, specPath: FieldPath): void => {
    if (!isObj(spec) || typeof spec.part !== 'string' || typeof spec.designator !== 'string') return;
    receivers.push({ part: spec.part, node, designator: spec.designator });
    receiverOrigins.push([...specPath, 'part']);
  };

  /** Drop: optional via at the tap, optional stub to a new node, the receiver at the stub's end. */
  const drop = (spec: Obj, specPath: FieldPath, tap: string, receiverPath: FieldPath = [...specPath, 'receiver']) => {
    if (spec.via !== undefined) {
      const c = readQuantity(issues, spec.via, 'viaC', [...specPath, 'via']);
      if (c !== null) push({ kind: 'via', a: tap, farads: c }, [...specPath, 'via']);
    }
    let at = tap;
    if (spec.stub !== undefined) {
      at = fresh(undefined);
      trace(spec.stub, [...specPath, 'stub'], tap, at);
    }
    addReceiver(spec.receiver, at, receiverPath);
  };

  const driverNode = input.driver.node ?? DRIVER_NODE;
  let current = driverNode;
  const run = (step: unknown, path: FieldPath) => {
    const kind = stepKind(issues, step, path);
    if (kind === null) return;
    const s = step as Obj;
    if (typeof s.name === 'string' && s.name in input.replacements && path[path.length - 2] !== input.replacementsPath[input.replacementsPath.length - 1]) {
      usedLabels.add(s.name);
      const replacement = input.replacements[s.name];
      if (replacement === null) return; // dropped for this net
      run(replacement, [...input.replacementsPath, s.name]);
      return;
    }
    const body = s[kind];
    const at = [...path, kind];
    switch (kind) {
      case 'trace': {
        const next = fresh(s.node);
        trace(body, at, current, next);
        current = next;
        return;
      }
      case 'series': {
        const ohms = readQuantity(issues, body, 'ohms', at);
        const next = fresh(s.node);
        if (ohms !== null) push({ kind: 'resistor', a: current, b: next, ohms }, at);
        current = next;
        return;
      }
      case 'inductor': {
        const henries = readQuantity(issues, body, 'henries', at);
        const next = fresh(s.node);
        if (henries !== null) push({ kind: 'inductor', a: current, b: next, henries }, at);
        current = next;
        return;
      }
      case 'line': {
        if (!isObj(body)) return;
        const z0 = readQuantity(issues, body.z0, 'z0', [...at, 'z0']);
        const delay = readQuantity(issues, body.delay, 'delay', [...at, 'delay']);
        const next = fresh(s.node);
        if (z0 !== null && delay !== null) push({ kind: 'line', a: current, b: next, z0, delay }, at);
        current = next;
        return;
      }
      case 'via': {
        const farads = readQuantity(issues, body, 'viaC', at);
        if (farads !== null) push({ kind: 'via', a: current, farads }, at);
        return;
      }
      case 'cap': {
        const farads = readQuantity(issues, body, 'farads', at);
        if (farads !== null) push({ kind: 'capacitor', a: current, b: 'gnd', farads }, at);
        return;
      }
      case 'receiver':
        addReceiver(body, current, at);
        return;
      case 'drop':
        if (isObj(body)) drop(body, at, current);
        return;
      case 'flyby': {
        if (!isObj(body) || !Array.isArray(body.receivers)) return;
        body.receivers.forEach((receiver, i) => {
          drop({ via: body.via, stub: body.stub, receiver }, at, current, [...at, 'receivers', i]);
          if (i < (body.receivers as unknown[]).length - 1) {
            const next = fresh(undefined);
            trace(body.between, [...at, 'between'], current, next);
            current = next;
          }
        });
        return;
      }
      case 'terminate': {
        if (!isObj(body)) return;
        const to = body.to;
        if (typeof to !== 'string') return;
        if (to !== 'gnd' && !input.rails.has(to)) {
          issues.push({ path: [...at, 'to'], message: `"${to}" is neither gnd nor a rail of the template (rails: ${[...input.rails].join(', ') || 'none'})` });
          return;
        }
        const ohms = readQuantity(issues, body.ohms, 'ohms', [...at, 'ohms']);
        if (ohms === null) return;
        if (body.farads === undefined) {
          push({ kind: 'resistor', a: current, b: to, ohms }, at);
        } else {
          // AC termination: series R then C to the rail (docs/design.md §4).
          const farads = readQuantity(issues, body.farads, 'farads', [...at, 'farads']);
          const mid = fresh(undefined);
          push({ kind: 'resistor', a: current, b: mid, ohms }, at);
          if (farads !== null) push({ kind: 'capacitor', a: mid, b: to, farads }, [...at, 'farads']);
        }
        return;
      }
    }
  };

  input.steps.forEach((step, i) => run(step, [...input.stepsPath, i]));

  for (const label of Object.keys(input.replacements)) {
    if (!usedLabels.has(label)) {
      issues.push({ path: [...input.replacementsPath, label], atKey: true, message: `the template has no step named "${label}"` });
    }
  }
  if (input.segments.length > traceIndex) {
    issues.push({
      path: [...input.segmentsPath, traceIndex],
      message: `the template has ${traceIndex} trace${traceIndex === 1 ? '' : 's'}; this override has no trace to apply to`,
    });
  }
  if (receivers.length === 0) issues.push({ path: input.stepsPath, message: 'the template places no receiver (add a receiver, drop or flyby step)' });
  return {
    elements,
    origins,
    driver: { part: input.driver.part, node: driverNode, designator: input.driver.designator },
    receivers,
    receiverOrigins,
  };
}

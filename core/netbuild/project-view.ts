/**
 * A read-only view of a project for people and tools: each routing layer's Z0 and delay, and each
 * net's routed length per layer with the Z0 and delay of every segment at its own width (a pair leg's
 * odd-mode Zodd, delay and Zdiff = 2·Zodd).
 * Derived from core/stackup; nothing here is stored.
 */
import { InputError } from '../errors.js';
import type { LayerProperties } from '../stackup/index.js';
import type { NetDefinition, ProjectData, Stackup } from '../project/model.js';
import { layerProperties, pairOnLayer, traceOnLayer } from '../stackup/index.js';

export interface SegmentView {
  elementIndex: number;
  layer: string;
  /** m */
  length: number;
  width: number;
  /** ohm; null when the stackup cannot give it (see `problem`). For a pair leg: the odd-mode Zodd. */
  z0: number | null;
  /** One-way delay of the segment, s (odd mode for a pair leg); null as z0. */
  delay: number | null;
  /** Edge gap to the partner leg of a differential pair, m; null for a single-ended trace. */
  spacing: number | null;
  /** Differential impedance 2·Zodd of the pair, ohm; null for single-ended or when unknown. */
  zdiff: number | null;
}

/** Routed path from the driver to one receiver. */
export interface ReceiverPathView {
  designator: string;
  node: string;
  /** Routed length along the path, m; null when the receiver is not connected to the driver. */
  length: number | null;
  /** Lossless one-way delay along the path, s (lines and segments; lumped parts add none), or null. */
  delay: number | null;
}

export interface NetView {
  name: string;
  bus: string;
  role: string;
  /** Sum of all segment lengths (stubs included), m. */
  length: number;
  /** Longest driver-to-receiver delay, s, or null when a segment's or path's delay is unknown. */
  delay: number | null;
  receivers: ReceiverPathView[];
  segments: SegmentView[];
  /** Set when some segment's Z0 could not be computed. */
  problem: string | null;
}

export interface ProjectView {
  layers: LayerProperties[];
  /** Why `layers` is empty or partial, or null. */
  layersProblem: string | null;
  nets: NetView[];
}

function messageOf(error: unknown): string {
  return error instanceof Error ? error.message : String(error);
}

interface Edge {
  to: string;
  length: number;
  /** s, or NaN when unknown. */
  delay: number;
}

/**
 * Shortest-delay path from the driver to each receiver through segments, lines and series parts;
 * never through ground or a rail (two terminations to VTT do not connect their nodes).
 */
function receiverPaths(net: NetDefinition, edges: Map<string, Edge[]>): ReceiverPathView[] {
  const best = new Map<string, { length: number; delay: number }>([[net.driver.node, { length: 0, delay: 0 }]]);
  const queue = [net.driver.node];
  while (queue.length > 0) {
    const node = queue.shift()!;
    const here = best.get(node)!;
    for (const edge of edges.get(node) ?? []) {
      const delay = here.delay + edge.delay;
      const known = best.get(edge.to);
      // NaN delays still connect (length stays meaningful); compare on delay where known.
      if (known && !(delay < known.delay) && !(Number.isNaN(known.delay) && !Number.isNaN(delay))) continue;
      best.set(edge.to, { length: here.length + edge.length, delay });
      queue.push(edge.to);
    }
  }
  return net.receivers.map((r) => {
    const path = best.get(r.node);
    return {
      designator: r.designator,
      node: r.node,
      length: path ? path.length : null,
      delay: path && !Number.isNaN(path.delay) ? path.delay : null,
    };
  });
}

export function viewNet(stackup: Stackup, net: NetDefinition): NetView {
  const segments: SegmentView[] = [];
  let problem: string | null = null;
  const blocked = new Set(['gnd', ...Object.keys(net.rails)]);
  const edges = new Map<string, Edge[]>();
  const connect = (a: string, b: string, length: number, delay: number) => {
    if (blocked.has(a) || blocked.has(b)) return;
    for (const [from, to] of [[a, b], [b, a]]) {
      const list = edges.get(from) ?? [];
      list.push({ to, length, delay });
      edges.set(from, list);
    }
  };
  net.elements.forEach((e, elementIndex) => {
    if (e.kind === 'line') connect(e.a, e.b, 0, e.delay);
    if (e.kind === 'resistor' || e.kind === 'inductor' || e.kind === 'capacitor') connect(e.a, e.b, 0, 0);
    if (e.kind !== 'segment') return;
    let z0: number | null = null;
    let zdiff: number | null = null;
    let segmentDelay: number | null = null;
    try {
      if (e.spacing === undefined) {
        const trace = traceOnLayer(stackup, e.layer, e.width);
        z0 = trace.z0;
        segmentDelay = e.length * trace.delayPerMetre;
      } else {
        // One leg of a differentially driven pair: odd mode (Cohn 1955), as core/netbuild models it.
        const leg = pairOnLayer(stackup, e.layer, e.width, e.spacing);
        z0 = leg.zodd;
        zdiff = leg.zdiff;
        segmentDelay = e.length * leg.delayPerMetreOdd;
      }
    } catch (error) {
      if (!(error instanceof InputError)) throw error;
      problem ??= messageOf(error);
    }
    connect(e.a, e.b, e.length, segmentDelay ?? Number.NaN);
    segments.push({
      elementIndex, layer: e.layer, length: e.length, width: e.width, z0, delay: segmentDelay, spacing: e.spacing ?? null, zdiff,
    });
  });
  const length = segments.reduce((sum, s) => sum + s.length, 0);
  const receivers = receiverPaths(net, edges);
  const delays = receivers.map((r) => r.delay);
  const delay = delays.length > 0 && delays.every((d) => d !== null) ? Math.max(...(delays as number[])) : null;
  return { name: net.name, bus: net.bus, role: net.role, length, delay, receivers, segments, problem };
}

export function viewProject(data: ProjectData): ProjectView {
  let layers: LayerProperties[] = [];
  let layersProblem: string | null = null;
  if (data.stackup.layers.length === 0) {
    layersProblem = 'the stackup has no layers yet';
  } else {
    try {
      layers = layerProperties(data.stackup);
    } catch (error) {
      if (!(error instanceof InputError)) throw error;
      layersProblem = messageOf(error);
    }
  }
  return { layers, layersProblem, nets: data.nets.map((net) => viewNet(data.stackup, net)) };
}

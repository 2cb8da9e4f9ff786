/**
 * Simulates one net at every corner and both edges and reduces each receiver waveform to the numbers
 * the budget needs (ReceiverEdgeMeasure). Pure and deterministic; the services call it in workers.
 */
import type { Corner, NetDefinition, ProjectData } from '../project/model.js';
import type { Circuit, DriverSpec } from '../circuit/types.js';
import { checkCircuit, delaysFromDriver } from '../circuit/topology.js';
import { rampStart, simulateEdge, simulateNet, WaveformBuffers, type Waveform } from '../solver/index.js';
import { referenceLoadCrossing } from '../measure/reference-load.js';
import { firstReturnTime, measureEdge, reflectionArrivals, type MeasureOptions } from '../measure/edge.js';
import { buildNetCircuit, isDifferentialNet, type NetBuildChanges } from '../netbuild/index.js';
import { differentialLevelHeld, pairDifference, zeroCrossings } from '../measure/differential.js';
import type { Edge, ReceiverEdgeMeasure } from '../budget/measures.js';

const EDGES: readonly Edge[] = ['rising', 'falling'];

/**
 * Reference-load crossings repeat for every net with the same driver part at a corner (and for every
 * trial of a length search): memoised by the driver's numbers, compared as numbers (a string key of
 * twelve numbers cost more than the lookup saves). Bounded so a long session cannot grow it; a miss
 * only costs the closed form again.
 */
const REFERENCE_MEMO_SIZE = 256;
const referenceMemo: { key: number[]; t: number }[] = [];
function referenceCrossing(driver: DriverSpec, edge: Edge, sourceStart?: number): number {
  const load = driver.refLoad;
  const key = [
    edge === 'rising' ? 1 : 0, driver.vlow, driver.vhigh, driver.routHigh, driver.routLow, driver.riseTime, driver.fallTime,
    driver.vmeas ?? NaN, load ? load.ohms : NaN, load ? load.vtt : NaN, load ? load.farads : NaN, sourceStart ?? NaN,
  ];
  // newest first: a length search asks for its net's crossing again and again
  for (let i = referenceMemo.length - 1; i >= 0; i--) if (sameNumbers(referenceMemo[i].key, key)) return referenceMemo[i].t;
  const t = referenceLoadCrossing(driver, edge, { sourceStart });
  if (referenceMemo.length >= REFERENCE_MEMO_SIZE) referenceMemo.length = 0;
  referenceMemo.push({ key, t });
  return t;
}

/** Element-wise Object.is (NaN stands for an absent value and equals itself). */
function sameNumbers(a: readonly number[], b: readonly number[]): boolean {
  for (let i = 0; i < a.length; i++) if (!Object.is(a[i], b[i])) return false;
  return true;
}

/**
 * Sample storage reused by every simulation of this module: the waveforms are measured and dropped
 * before the next simulation (this code is synchronous; each worker thread has its own module).
 */
const scratch = new WaveformBuffers();

/** Measures of every receiver of `circuit` (built for `net` at `corner`) on one edge. */
export function measureCircuitEdge(net: NetDefinition, circuit: Circuit, corner: Corner, edge: Edge): ReceiverEdgeMeasure[] {
  return measureCircuit(net, circuit, corner, [edge]);
}

/**
 * Measures of every receiver of `circuit` on the given edges. Both edges come from one simulateNet
 * call (one compiled circuit; one march for a symmetric driver, the falling edge by superposition,
 * core/solver/transient.ts), and the circuit's delays from the driver are found once for all
 * receivers and edges instead of once per measurement.
 */
export function measureCircuit(net: NetDefinition, circuit: Circuit, corner: Corner, edges: readonly Edge[]): ReceiverEdgeMeasure[] {
  let waves: Partial<Record<Edge, Waveform>>;
  const options = { buffers: scratch };
  // a differential pair is timed at its legs' crossing, which needs both edges (the two legs)
  const differential = isDifferentialNet(net);
  if ((edges.length === 2 && edges[0] !== edges[1]) || (differential && edges.length > 0)) waves = simulateNet(circuit, options);
  else waves = edges.length > 0 ? { [edges[0]]: simulateEdge(circuit, edges[0], options) } : {};
  const delays = delaysFromDriver(circuit);
  const reflected = reflectionArrivals(circuit, edges);
  const firstReturn = firstReturnTime(circuit, delays);
  const out: ReceiverEdgeMeasure[] = [];
  for (const edge of edges) out.push(...measureWave(net, circuit, corner, edge, waves[edge]!, { delays, firstReturn, reflected: reflected[edge] }));
  if (differential) timeAtLegCrossing(out, waves.rising!, waves.falling!);
  return out;
}

function measureWave(
  net: NetDefinition, circuit: Circuit, corner: Corner, edge: Edge, wave: Waveform, shared: MeasureOptions,
): ReceiverEdgeMeasure[] {
  const tReference = referenceCrossing(circuit.driver, edge, netSourceStart(circuit, edge, wave));
  const tStop = wave.t[wave.t.length - 1];
  return circuit.receivers.map((spec, i) => {
    const m = measureEdge(wave, circuit, spec.node, edge, shared);
    const rising = edge === 'rising';
    const far = rising ? spec.vih : spec.vil;
    // no far crossing at all: the distance by which the extreme level falls short of the threshold
    const ringback = m.ringbackMargin ?? (rising ? m.vmax - far : far - m.vmin);
    return {
      receiver: net.receivers[i].designator,
      node: spec.node,
      corner: corner.name,
      edge,
      tReference,
      tNearFirst: m.tNearFirst,
      tFarLast: m.tFarLast,
      vFirstIncidence: m.vFirstIncidence,
      firstIncidence: m.firstIncidence,
      vmax: m.vmax,
      vmin: m.vmin,
      ringbackMargin: ringback,
      monotonic: m.monotonic,
      vil: spec.vil,
      vih: spec.vih,
      vmaxAbs: spec.vmaxAbs ?? Infinity,
      vminAbs: spec.vminAbs ?? -Infinity,
      tStop,
      // through the band, first near to first far crossing (slew-rate derating, docs/design.md §6.4)
      slew: m.tNearFirst !== null && m.tFarFirst !== null && m.tFarFirst > m.tNearFirst
        ? Math.abs(spec.vih - spec.vil) / (m.tFarFirst - m.tNearFirst) : null,
    };
  });
}

/** Every receiver, corner and edge of a net (optionally with a changed length or a trial termination). */
export function simulateNetMeasures(
  project: Pick<ProjectData, 'stackup' | 'parts' | 'corners' | 'ibisFiles'>,
  net: NetDefinition,
  changes: NetBuildChanges = {},
  corners: readonly Corner[] = project.corners,
  /** Edges to simulate at a corner (default both). */
  edgesAt: (corner: Corner) => readonly Edge[] = () => EDGES,
  /**
   * Set when this net's circuit already passed the structural check with the same topology (a length
   * search's trial changes a segment's length, never what connects to what).
   */
  topologyChecked = false,
): ReceiverEdgeMeasure[] {
  const out: ReceiverEdgeMeasure[] = [];
  let checked = topologyChecked;
  for (const corner of corners) {
    const circuit = buildNetCircuit(net, project.stackup, project.parts, corner, changes, project.ibisFiles);
    // corners scale values, never the topology: one structural check per net is enough
    if (!checked) checkCircuit(circuit, `net ${net.name}`);
    checked = true;
    out.push(...measureCircuit(net, circuit, corner, edgesAt(corner)));
  }
  return out;
}

/**
 * A differential strobe or clock is timed at the crossing of its legs, not at leg thresholds
 * (docs/design.md §5): both edges of the pair cross at the same times (the falling pair edge is the
 * same two legs exchanged), so the first and last crossing are each measure's near and far times. The
 * differential level is checked on Vdiff itself against VIH,diff = VIH − VIL of the leg thresholds.
 */
function timeAtLegCrossing(measures: ReceiverEdgeMeasure[], rising: Waveform, falling: Waveform): void {
  // One receiver node's pair at this corner: both pair edges share its crossings and its level check
  // (the receiver's thresholds are the same on both edges).
  type PairAtNode = { first: number | null; last: number | null; threshold: number; level: number };
  const byNode = new Map<string, PairAtNode>();
  for (const m of measures) {
    let c = byNode.get(m.node);
    if (!c) {
      const i = rising.nodes.indexOf(m.node);
      const j = falling.nodes.indexOf(m.node);
      const diff = pairDifference(rising.t, rising.v[i], falling.t, falling.v[j]);
      const threshold = m.vih - m.vil;
      c = { ...zeroCrossings(rising.t, diff), threshold, level: differentialLevelHeld(diff, threshold).level };
      byNode.set(m.node, c);
    }
    m.tNearFirst = c.first;
    m.tFarLast = c.last;
    // the pair's differential slew is twice a leg's (Vdiff = 2(Vleg − Vcm) in the odd mode)
    if (m.slew) m.slew *= 2;
    m.differential = { threshold: c.threshold, level: c.level };
  }
}

/**
 * Where the ideal source's ramp starts in this net (rampStart of the net's DC pin level), for an
 * asymmetric driver; undefined for a symmetric one (the ramp starts at the old level in any load). The
 * reference load is driven by the same source waveform (docs/design.md §5).
 */
function netSourceStart(circuit: Circuit, edge: Edge, wave: Waveform): number | undefined {
  const d = circuit.driver;
  if (d.routHigh === d.routLow) return undefined;
  const rising = edge === 'rising';
  const index = wave.nodes.indexOf(d.node);
  if (index < 0) return undefined;
  return rampStart(wave.initial[index], rising ? d.vlow : d.vhigh, rising ? d.routLow : d.routHigh, rising ? d.routHigh : d.routLow);
}

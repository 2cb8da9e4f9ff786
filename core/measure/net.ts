/**
 * Every receiver of a net on both edges, in the shape of the `slackline sim --json` output (docs/design.md §8.5).
 */
import type { Circuit } from '../circuit/types.js';
import { delaysFromDriver } from '../circuit/topology.js';
import { referenceLoadCrossing } from './reference-load.js';
import type { Waveform } from '../solver/transient.js';
import { type EdgeMeasurements, firstReturnTime, measureEdge, reflectionArrivals, type MeasureOptions } from './edge.js';

export interface ReceiverMeasurements {
  node: string;
  rising: EdgeMeasurements;
  falling: EdgeMeasurements;
}

/**
 * Measures all receivers. When the driver has a reference load, flight times are compensated by its
 * crossing of Vmeas into that load (docs/design.md §5).
 */
export function measureReceivers(
  circuit: Circuit, waves: { rising: Waveform; falling: Waveform }, options: { settleBand?: number } = {},
): ReceiverMeasurements[] {
  const reference = circuit.driver.refLoad
    ? { rising: referenceLoadCrossing(circuit.driver, 'rising'), falling: referenceLoadCrossing(circuit.driver, 'falling') }
    : null;
  const delays = delaysFromDriver(circuit);
  const firstReturn = firstReturnTime(circuit, delays);
  const reflected = reflectionArrivals(circuit, ['rising', 'falling']);
  const rising: MeasureOptions = { ...options, delays, firstReturn, referenceCrossing: reference?.rising, reflected: reflected.rising };
  const falling: MeasureOptions = { ...options, delays, firstReturn, referenceCrossing: reference?.falling, reflected: reflected.falling };
  return circuit.receivers.map((r) => ({
    node: r.node,
    rising: measureEdge(waves.rising, circuit, r.node, 'rising', rising),
    falling: measureEdge(waves.falling, circuit, r.node, 'falling', falling),
  }));
}

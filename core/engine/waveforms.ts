/**
 * Waveforms of one net for the net view: the driver pin and every receiver, at every corner and both
 * edges, with each receiver's thresholds and absolute limits at every corner (each corner's own levels:
 * thresholds and rails move with the corner's rail factor, docs/design.md §4), and at the typical
 * corner's rail for callers that draw one set.
 */
import type { ProjectData } from '../project/model.js';
import { simulateEdge } from '../solver/index.js';
import { checkCircuit } from '../circuit/topology.js';
import { buildNetCircuit } from '../netbuild/index.js';
import { findNet } from './solve-net.js';

/** Waveforms of one receiver for the net view: per corner and edge. */
export interface NetWaveforms {
  net: string;
  corners: {
    corner: string;
    edge: 'rising' | 'falling';
    t: number[];
    /** node -> volts, including the driver pin. */
    v: Record<string, number[]>;
    /**
     * This corner's levels per receiver and the driver's rails at this corner, V (draw these beside this
     * corner's waveform; optional for waveforms made before they existed).
     */
    thresholds?: CornerThreshold[];
  }[];
  /** The typical corner's levels (the corner with rail factor 1, else the first). */
  thresholds: { receiver: string; vil: number; vih: number; vmaxAbs: number; vminAbs: number }[];
}

/** One receiver's levels at one corner, V. */
export interface CornerThreshold {
  receiver: string;
  vil: number;
  vih: number;
  vmaxAbs: number;
  vminAbs: number;
  /** The driver's low and high levels at this corner (the rails the waveform swings between). */
  vlow: number;
  vhigh: number;
}

export function netWaveforms(project: ProjectData, name: string): NetWaveforms {
  const net = findNet(project, name);
  const corners: NetWaveforms['corners'] = [];
  let thresholds: NetWaveforms['thresholds'] = [];
  for (const corner of project.corners) {
    const circuit = buildNetCircuit(net, project.stackup, project.parts, corner, {}, project.ibisFiles);
    checkCircuit(circuit, `net ${net.name} at the ${corner.name} corner`);
    const shown = [net.driver.node, ...net.receivers.map((r) => r.node)];
    const own: CornerThreshold[] = circuit.receivers.map((r, i) => ({
      receiver: net.receivers[i].designator, vil: r.vil, vih: r.vih, vmaxAbs: r.vmaxAbs ?? 0, vminAbs: r.vminAbs ?? 0,
      vlow: circuit.driver.vlow, vhigh: circuit.driver.vhigh,
    }));
    for (const edge of ['rising', 'falling'] as const) {
      const wave = simulateEdge(circuit, edge);
      const v: Record<string, number[]> = {};
      for (const node of shown) {
        const index = wave.nodes.indexOf(node);
        if (index >= 0) v[node] = Array.from(wave.v[index]);
      }
      corners.push({ corner: corner.name, edge, t: Array.from(wave.t), v, thresholds: own });
    }
    if (thresholds.length === 0 || corner.rail === 1) {
      thresholds = circuit.receivers.map((r, i) => ({
        receiver: net.receivers[i].designator,
        vil: r.vil,
        vih: r.vih,
        vmaxAbs: r.vmaxAbs ?? 0,
        vminAbs: r.vminAbs ?? 0,
      }));
    }
  }
  return { net: net.name, corners, thresholds };
}

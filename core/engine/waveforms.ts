/**
 * Waveforms of one net for the net view: the driver pin and every receiver, at every corner and both
 * edges, with each receiver's thresholds and absolute limits (at the typical corner's rail).
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
  }[];
  thresholds: { receiver: string; vil: number; vih: number; vmaxAbs: number; vminAbs: number }[];
}

export function netWaveforms(project: ProjectData, name: string): NetWaveforms {
  const net = findNet(project, name);
  const corners: NetWaveforms['corners'] = [];
  let thresholds: NetWaveforms['thresholds'] = [];
  for (const corner of project.corners) {
    const circuit = buildNetCircuit(net, project.stackup, project.parts, corner, {}, project.ibisFiles);
    checkCircuit(circuit, `net ${net.name} at the ${corner.name} corner`);
    const shown = [net.driver.node, ...net.receivers.map((r) => r.node)];
    for (const edge of ['rising', 'falling'] as const) {
      const wave = simulateEdge(circuit, edge);
      const v: Record<string, number[]> = {};
      for (const node of shown) {
        const index = wave.nodes.indexOf(node);
        if (index >= 0) v[node] = Array.from(wave.v[index]);
      }
      corners.push({ corner: corner.name, edge, t: Array.from(wave.t), v });
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

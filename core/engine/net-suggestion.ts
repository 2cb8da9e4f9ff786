/**
 * Termination suggestion for a net failing on signal quality: trial series and far-end parallel
 * resistors, each judged by re-simulating the net (core/engine/termination.ts searches the values).
 */
import type { NetDefinition, ProjectData } from '../project/model.js';
import type { TerminationSuggestion } from '../budget/results.js';
import type { ReceiverEdgeMeasure } from '../budget/measures.js';
import { qualityMarginVolts } from '../budget/quality.js';
import { delaysFromDriver, fullRampTime } from '../circuit/topology.js';
import { buildNetCircuit, netParts, type NetBuildChanges } from '../netbuild/index.js';
import { combinedMargin, suggestTermination } from './termination.js';
import type { Evaluation, Evaluator } from './net-evaluation.js';
import type { NetKind } from './net-lookup.js';
import type { Simulate } from './net-window.js';

export function netTerminationSuggestion(
  project: ProjectData, net: NetDefinition, kind: NetKind,
  measures: readonly ReceiverEdgeMeasure[], own: Evaluation, evaluate: Evaluator, simulate: Simulate,
): TerminationSuggestion | null {
  const driver = netParts(net, project.parts).driver.model;
  const slew = (driver.voh - driver.vol) / fullRampTime(Math.max(driver.riseTime, driver.fallTime));
  const timingOf = (e: { setup: number; hold: number }): number => (kind === 'quality-only' ? Infinity : Math.min(e.setup, e.hold));
  const qualityMargin = Math.min(...measures.map(qualityMarginVolts));
  const before = combinedMargin(timingOf(own), qualityMargin, slew);
  const typical = project.corners.find((c) => c.rail === 1 && c.driverStrength === 1) ?? project.corners[0];
  const circuit = buildNetCircuit(net, project.stackup, project.parts, typical);
  const delays = delaysFromDriver(circuit);
  const farEnd = net.receivers.reduce((a, b) => ((delays.get(b.node) ?? 0) > (delays.get(a.node) ?? 0) ? b : a));
  const vtt = (driver.vol + driver.voh) / 2;
  return suggestTermination(
    (trialKind, ohms) => {
      const changes: NetBuildChanges = trialKind === 'series' ? { series: ohms } : { parallel: { node: farEnd.node, ohms, vtt } };
      const ms = simulate(changes);
      const e = evaluate(ms);
      return combinedMargin(timingOf(e), Math.min(...ms.map(qualityMarginVolts)), slew);
    },
    before,
    { seriesAt: `${net.driver.designator} pin`, parallelAt: `${farEnd.designator} (node ${farEnd.node})`, vtt },
  );
}

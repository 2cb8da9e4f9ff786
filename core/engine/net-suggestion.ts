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
  const circuit = buildNetCircuit(net, project.stackup, project.parts, typical, {}, project.ibisFiles);
  const delays = delaysFromDriver(circuit);
  const farEnd = net.receivers.reduce((a, b) => ((delays.get(b.node) ?? 0) > (delays.get(a.node) ?? 0) ? b : a));
  // The bus's I/O standard and the board's rails (docs/design.md §6.3): a parallel termination only to a
  // rail the net has (never an invented mid-rail), and the option the net already uses tried first.
  const rails = Object.entries(net.rails).filter(([, v]) => v > 0);
  const rail = rails.find(([name]) => /vtt/i.test(name)) ?? rails[0] ?? null;
  const fixed = new Set(['gnd', ...Object.keys(net.rails)]);
  const seriesIndex = net.elements.findIndex((e) => e.kind === 'resistor' &&
    ((e.a === net.driver.node && !fixed.has(e.b)) || (e.b === net.driver.node && !fixed.has(e.a))));
  const endIndex = net.elements.findIndex((e) => e.kind === 'resistor' && (fixed.has(e.a) || fixed.has(e.b)) && !(e.a === net.driver.node || e.b === net.driver.node));
  const kinds: ('series' | 'parallel-end')[] = [];
  if (endIndex >= 0 && rail) kinds.push('parallel-end');
  kinds.push('series');
  if (rail && !kinds.includes('parallel-end')) kinds.push('parallel-end');
  if (seriesIndex >= 0) kinds.sort((a, b) => (a === 'series' ? -1 : b === 'series' ? 1 : 0));
  const vtt = rail ? rail[1] : 0;
  const rHigh = driver.routHigh;
  const rLow = driver.routLow;
  return suggestTermination(
    (trialKind, ohms) => {
      let changes: NetBuildChanges;
      if (trialKind === 'series') changes = seriesIndex >= 0 ? { resistor: { elementIndex: seriesIndex, ohms } } : { series: ohms };
      else changes = endIndex >= 0 ? { resistor: { elementIndex: endIndex, ohms } } : { parallel: { node: farEnd.node, ohms, vtt } };
      const ms = simulate(changes);
      const e = evaluate(ms);
      return combinedMargin(timingOf(e), Math.min(...ms.map(qualityMarginVolts)), slew);
    },
    before,
    {
      seriesAt: seriesIndex >= 0 ? `${net.driver.designator} pin, the series resistor it has (element ${seriesIndex + 1})` : `${net.driver.designator} pin`,
      parallelAt: endIndex >= 0 ? `the end termination it has (element ${endIndex + 1})` : `${farEnd.designator} (node ${farEnd.node})`,
      vtt,
      rail: rail?.[0],
      // DC divider of the driver (VOH behind its pull-up, VOL behind its pull-down) and R to VTT (Ohm's law)
      power: (ohms) => {
        const at = (v: number, r: number) => (v / r + vtt / ohms) / (1 / r + 1 / ohms);
        return { high: (at(driver.voh, rHigh) - vtt) ** 2 / ohms, low: (at(driver.vol, rLow) - vtt) ** 2 / ohms };
      },
    },
    kinds,
  );
}

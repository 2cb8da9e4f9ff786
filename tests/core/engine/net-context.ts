/**
 * The context a net's evaluator needs, as a board solve gives it (docs/design.md §6): for a timed net
 * the measures of its bus's strobe or clock net, for a strobe those of its bus's timed nets, each
 * simulated at every corner and edge. For the engine tests that evaluate nets of the demo themselves.
 */
import { busOf, clockOf, findNet, netKind, strobeOf } from '../../../core/engine/net-lookup.js';
import { projectForBus } from '../../../core/engine/corner-set.js';
import { simulateNetMeasures } from '../../../core/engine/simulate-net.js';
import type { NetMeasures } from '../../../core/engine/net-evaluation.js';
import type { ProjectData } from '../../../core/project/model.js';

export function evaluationContext(board: ProjectData, name: string) {
  const net = findNet(board, name);
  const bus = busOf(board, net);
  const project = projectForBus(board, bus);
  const kind = netKind(project, net);
  const context: { strobe?: NetMeasures | null; dataNets?: NetMeasures[] } = {};
  if (kind === 'timed') {
    const reference = strobeOf(project, bus) ?? clockOf(project, bus);
    context.strobe = reference ? { net: reference.name, measures: simulateNetMeasures(project, reference) } : null;
  }
  if (kind === 'strobe') {
    context.dataNets = project.nets
      .filter((n) => n.bus === bus.name && n.name !== name && netKind(project, n) === 'timed')
      .map((n) => ({ net: n.name, measures: simulateNetMeasures(project, n) }));
  }
  return { project, net, kind, context };
}

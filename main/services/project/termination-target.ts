/**
 * Where a suggested far-end termination goes: the receiver the driver's wave reaches last in the
 * typical corner, to a rail at the driver's mid swing — the same rule the check's suggestion uses
 * (core/engine/net-suggestion.ts), so the applied resistor is the one that was evaluated.
 */
import { require_ } from '../../../core/errors.js';
import { delaysFromDriver } from '../../../core/circuit/topology.js';
import { buildNetCircuit, netParts } from '../../../core/netbuild/index.js';
import type { TerminationChange } from '../../../core/design/edits.js';
import type { TerminationSuggestion } from '../../../core/budget/results.js';
import type { ProjectData } from '../../../core/project/model.js';

export function terminationChange(project: ProjectData, netName: string, suggestion: TerminationSuggestion): TerminationChange {
  if (suggestion.kind === 'series') return { kind: 'series', ohms: suggestion.ohms };
  const net = project.nets.find((n) => n.name === netName);
  require_(net !== undefined, `net ${netName}`, 'is not in the project');
  const driver = netParts(net, project.parts).driver.model;
  const typical = project.corners.find((c) => c.rail === 1 && c.driverStrength === 1) ?? project.corners[0];
  const delays = delaysFromDriver(buildNetCircuit(net, project.stackup, project.parts, typical, {}, project.ibisFiles));
  const farEnd = net.receivers.reduce((a, b) => ((delays.get(b.node) ?? 0) > (delays.get(a.node) ?? 0) ? b : a));
  return { kind: 'parallel-end', ohms: suggestion.ohms, node: farEnd.node, vtt: (driver.vol + driver.voh) / 2 };
}

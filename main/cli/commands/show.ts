/** `slackline show FILE [--json]`: stackup, buses and nets with lengths, Z0 and delay. */
import { parseArgs } from 'node:util';
import { InputError } from '../../../core/errors.js';
import type { BusDefinition, ProjectData } from '../../../core/project/model.js';
import { formatIn } from '../../../core/units/quantity.js';
import { openProjectServices } from '../../services/compose.js';
import { viewProject, type NetView, type ProjectView } from '../../../core/netbuild/project-view.js';
import { printJson, type CliCommand, type CliIo } from '../command.js';

const usage = `Usage: slackline show FILE [--json]

Prints the project: stackup layers, each routing layer's Z0 and delay at its default width, the
buses with their timing, and every net with its routed length per layer and the Z0 and delay of
each segment at its own width, and the routed length and delay from the driver to each receiver
(lossless, from the stackup's closed forms; vias and lumped parts add no delay here). A segment of a
differential pair (with a gap) is one leg driven differentially: its Z0 and delay are the odd-mode
values, shown with the pair's gap and Zdiff = 2·Zodd.

  --json  print {"path", "data", "view"} in SI units (m, s, ohm, F, V)`;

const mm = (m: number) => formatIn(m, 'mm', 3);
const psText = (s: number | null) => (s === null ? '—' : formatIn(s, 'ps', 0));
const ohm = (z: number | null) => (z === null ? '—' : formatIn(z, 'Ω', 1));

function timingText(bus: BusDefinition): string {
  const t = bus.timing;
  return t.kind === 'common-clock'
    ? `cycle ${formatIn(t.cycleTime, 'ps', 0)}, clock skew ${formatIn(t.clockSkew, 'ps', 0)}, jitter ${formatIn(t.jitter, 'ps', 0)}`
    : `valid before ${formatIn(t.tValidBefore, 'ps', 0)}, after ${formatIn(t.tValidAfter, 'ps', 0)}`;
}

function netLine(net: NetView): string {
  const segments = net.segments
    .map((s) => `${s.layer} ${mm(s.length)} ${ohm(s.z0)}${s.spacing === null ? '' : ` (pair, gap ${mm(s.spacing)}, Zdiff ${ohm(s.zdiff)})`}`)
    .join(', ');
  const lines = [
    `    ${net.name.padEnd(8)} ${net.role.padEnd(8)} ${mm(net.length).padStart(10)} ${psText(net.delay).padStart(7)}  ${segments}` +
      (net.problem ? `  (${net.problem})` : ''),
  ];
  if (net.receivers.length > 1) {
    const paths = net.receivers.map((r) => `${r.designator} ${r.length === null ? 'not connected' : `${mm(r.length)} ${psText(r.delay)}`}`);
    lines.push(`${' '.repeat(40)}to ${paths.join(', ')}`);
  }
  return lines.join('\n');
}

function text(path: string, data: ProjectData, view: ProjectView): string {
  const lines = [
    `${data.info.name}${data.info.boardRevision ? ` (rev ${data.info.boardRevision})` : ''} — ${path}`,
    ...(data.info.description ? [data.info.description] : []),
    '',
    `Stackup: ${data.stackup.name || '(unnamed)'}, ${data.stackup.layers.length} layers`,
    ...data.stackup.layers.map((l) => {
      const extra = l.kind === 'copper' ? `${l.role}${l.defaultWidth ? `, width ${mm(l.defaultWidth)}` : ''}` : `Dk ${l.dk ?? '—'}${l.df !== undefined ? `, Df ${l.df}` : ''}`;
      return `  ${l.name.padEnd(10)} ${l.kind.padEnd(10)} ${formatIn(l.thickness, 'um', 0).padStart(8)}  ${extra}`;
    }),
    '',
    'Routing layers (at default width):',
    ...(view.layersProblem ? [`  ${view.layersProblem}`] : []),
    ...view.layers.map(
      (l) => `  ${l.layer.padEnd(10)} ${l.structure.padEnd(20)} Z0 ${ohm(l.z0)}, eps_eff ${l.epsEff.toFixed(2)}, ${formatIn(l.delayPerMetre, 'ps/mm', 2)}`,
    ),
    '',
    `Buses (${data.buses.length}) and nets (${data.nets.length}): name, role, routed length (all segments), ` +
      'delay to the farthest receiver, segments (layer, length, Z0; a differential pair leg shows its odd-mode Zodd and delay)',
  ];
  for (const bus of data.buses) {
    lines.push(`  ${bus.name}: ${bus.kind}, reference ${bus.referenceNet ?? '—'}, ${timingText(bus)}`);
    lines.push(...view.nets.filter((n) => n.bus === bus.name).map(netLine));
  }
  if (data.ibisFiles?.length) {
    lines.push('', 'IBIS files (docs/ibis.md §9): name, SHA-256, parts using a model of it');
    for (const f of data.ibisFiles) {
      const users = data.parts.filter((p) => p.ibis?.file === f.name).map((p) => `${p.name} -> ${p.ibis!.model}`);
      lines.push(`  ${f.name}  ${f.sha256}  ${users.join(', ') || 'unused'}`);
    }
  }
  lines.push('', `Corners: ${data.corners.map((c) => c.name).join(', ')}`);
  lines.push('Z0 and delay are lossless closed-form estimates; vendor models, design rules and measurement remain the authority.');
  return lines.join('\n');
}

async function run(argv: string[], io: CliIo): Promise<number> {
  const { values, positionals } = parseArgs({
    args: argv,
    strict: true,
    allowPositionals: true,
    options: { json: { type: 'boolean', default: false } },
  });
  if (positionals.length !== 1) throw new InputError('FILE', positionals.length === 0 ? 'is required' : 'give exactly one project file');
  const path = positionals[0];
  const services = openProjectServices(path);
  let data: ProjectData;
  try {
    data = services.store.load();
  } finally {
    await services.close();
  }
  const view = viewProject(data);
  // Stored IBIS texts can be megabytes: --json lists each file by name, hash and size instead.
  const listed = data.ibisFiles ? { ...data, ibisFiles: data.ibisFiles.map((f) => ({ name: f.name, sha256: f.sha256, characters: f.text.length })) } : data;
  if (values.json) printJson(io, { path, data: listed, view });
  else io.out(text(path, data, view));
  return 0;
}

export const command: CliCommand = { name: 'show', summary: 'print stackup, buses and nets of a project', usage, run };

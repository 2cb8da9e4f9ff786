/**
 * `slackline stackup FILE.json`: classifies every routing layer of a JSON stackup and prints its
 * structure, Z0, eps_eff and delay per length at the layer's default width.
 */
import { parseArgs } from 'node:util';
import { InputError } from '../../../core/errors.js';
import { classifyStackup, layerProperties, plausibilityNotes, SOLVERS, stackupFromJson, validityNotes, type Solver } from '../../../core/stackup/index.js';
import { formatIn } from '../../../core/units/index.js';
import { printJson, type CliCommand, type CliIo } from '../command.js';
import { readJsonFile } from '../read-json.js';

const usage = `Usage: slackline stackup FILE.json [--solver SOLVER] [--json]

FILE.json holds {"name": ..., "layers": [...]} with layers listed top to bottom. Each layer has
"name", "kind" (copper | dielectric | mask), "thickness"; copper layers a "role" (signal | plane) and,
for signal layers, a "defaultWidth"; dielectric and mask layers "dk" (and optionally "df").
Lengths take units ("4.5mil", "0.1mm", "1oz"); bare numbers are metres.
--solver ${SOLVERS.join(' | ')} forces one method for every layer; by default the field solver takes layers
with solder mask, thick copper (T/h > 0.2) or an offset stripline, the closed forms the rest.
--json prints the layers in SI units (m, ohm, m/s, s/m); each layer's "method" says which solver gave it.`;

async function run(argv: string[], io: CliIo): Promise<number> {
  const { values, positionals } = parseArgs({
    args: argv,
    strict: true,
    allowPositionals: true,
    options: { json: { type: 'boolean', default: false }, solver: { type: 'string' } },
  });
  if (positionals.length !== 1) throw new InputError('FILE.json', positionals.length === 0 ? 'is required' : 'give exactly one stackup file');
  const file = positionals[0];
  const stackup = stackupFromJson(readJsonFile(file), file);
  const sections = classifyStackup(stackup);
  if (values.solver !== undefined && !(SOLVERS as readonly string[]).includes(values.solver)) {
    throw new InputError('--solver', `unknown solver "${values.solver}" (known: ${SOLVERS.join(', ')})`);
  }
  const layers = layerProperties(stackup, undefined, { solver: values.solver as Solver | undefined });
  // Each layer's validity notes: the closed form's published range (when it gave the numbers) and absurd geometry.
  const notes = layers.map((p, i) => {
    const geometry = { ...sections[i], width: p.width };
    return [...(p.method === 'field' ? [] : validityNotes(geometry)), ...plausibilityNotes(geometry)];
  });
  if (values.json) {
    printJson(io, {
      stackup: stackup.name,
      layers: layers.map((p, i) => ({
        ...p,
        dk: sections[i].er,
        thickness: sections[i].thickness,
        below: sections[i].below,
        above: sections[i].above ?? null,
        cover: sections[i].cover ?? null,
        notes: notes[i],
      })),
    });
    return 0;
  }
  const rows = [
    `Stackup "${stackup.name}": ${layers.length} routing layer(s), default widths`,
    `${'layer'.padEnd(10)} ${'structure'.padEnd(20)} ${'width'.padStart(9)} ${'H1'.padStart(9)} ${'H2/cover'.padStart(9)} ${'Dk'.padStart(5)} ${'Z0'.padStart(8)} ${'eps_eff'.padStart(7)} ${'delay'.padStart(11)} ${'delay'.padStart(11)}  method`,
  ];
  layers.forEach((p, i) => {
    const s = sections[i];
    const other = s.above ?? s.cover;
    rows.push(
      `${p.layer.padEnd(10)} ${p.structure.padEnd(20)} ${formatIn(p.width, 'mil', 2).padStart(9)} ${formatIn(s.below, 'mil', 2).padStart(9)} ${(other === undefined ? '—' : formatIn(other, 'mil', 2)).padStart(9)} ${s.er.toFixed(2).padStart(5)} ${formatIn(p.z0, 'Ω', 1).padStart(8)} ${p.epsEff.toFixed(3).padStart(7)} ${formatIn(p.delayPerMetre, 'ps/in', 1).padStart(11)} ${formatIn(p.delayPerMetre, 'ps/mm', 2).padStart(11)}  ${p.method === 'field' ? `field (±${((p.convergence ?? 0) * 100).toFixed(1)} %)` : 'closed form'}`,
    );
  });
  layers.forEach((p, i) => rows.push(...notes[i].map((n) => `note: ${p.layer}: ${n}`)));
  rows.push(
    'Closed forms: Hammerstad & Jensen 1980 (microstrip), IPC-2141A cover correction (embedded), Wheeler 1978',
    '(stripline), parallel combination (offset stripline); Dk: thickness-weighted average of the layers between',
    'trace and plane(s). Field: 2-D finite-difference field solution of each layer\'s own dielectrics and mask',
    '(± its convergence estimate). Vendor data and coupons remain the authority.',
  );
  io.out(rows.join('\n'));
  return 0;
}

export const command: CliCommand = {
  name: 'stackup',
  summary: 'classify the routing layers of a JSON stackup and print their Z0 and delay',
  usage,
  run,
};

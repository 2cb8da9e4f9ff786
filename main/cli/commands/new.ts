/**
 * `slackline new FILE [--name TEXT] [--from DESIGN.yaml] [--json]`: creates an empty project file, or
 * one built from a design file (docs/design-file.md), all-or-nothing.
 */
import { basename } from 'node:path';
import { parseArgs } from 'node:util';
import { InputError } from '../../../core/errors.js';
import { createProject, createProjectFromDesignFile } from '../../services/compose.js';
import { emptyProject } from '../../../core/project/empty.js';
import { printJson, type CliCommand, type CliIo } from '../command.js';

const usage = `Usage: slackline new FILE [--name TEXT] [--from DESIGN.yaml] [--json]

Creates a new project file (SQLite). Without --from: project info and the starting slow/typical/fast
corners, no stackup, parts, buses or nets yet. With --from: the whole board of a design file
(docs/design-file.md); a design file with any problem writes no project, and every problem is listed
with file, line, column and field. Refuses to overwrite an existing file.

  --name TEXT           project name (default: the design's name, else the file name without extension)
  --from DESIGN.yaml    build the project from this design file
  --json                print {"path", "name"} (with --from also "buses", "nets")`;

async function run(argv: string[], io: CliIo): Promise<number> {
  const { values, positionals } = parseArgs({
    args: argv,
    strict: true,
    allowPositionals: true,
    options: { name: { type: 'string' }, from: { type: 'string' }, json: { type: 'boolean', default: false } },
  });
  if (positionals.length !== 1) throw new InputError('FILE', positionals.length === 0 ? 'is required' : 'give exactly one project file');
  const path = positionals[0];
  if (values.from !== undefined) {
    if (values.name !== undefined) throw new InputError('--name', 'the project name comes from the design file (project.name) with --from');
    const data = createProjectFromDesignFile(path, values.from);
    const summary = { path, name: data.info.name, buses: data.buses.length, nets: data.nets.length };
    if (values.json) printJson(io, summary);
    else io.out(`Created project "${data.info.name}" in ${path} from ${values.from}: ${data.buses.length} buses, ${data.nets.length} nets, ${data.parts.length} parts`);
    return 0;
  }
  const name = values.name ?? basename(path).replace(/\.[^.]+$/, '');
  createProject(path, emptyProject(name));
  if (values.json) printJson(io, { path, name });
  else io.out(`Created project "${name}" in ${path}`);
  return 0;
}

export const command: CliCommand = { name: 'new', summary: 'create a project file (empty, or from a design file)', usage, run };

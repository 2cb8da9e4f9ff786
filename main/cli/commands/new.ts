/** `slackline new FILE [--name TEXT] [--json]`: creates an empty project file. */
import { basename } from 'node:path';
import { parseArgs } from 'node:util';
import { InputError } from '../../../core/errors.js';
import { createProject } from '../../services/compose.js';
import { emptyProject } from '../../../core/project/empty.js';
import { printJson, type CliCommand, type CliIo } from '../command.js';

const usage = `Usage: slackline new FILE [--name TEXT] [--json]

Creates a new, empty project file (SQLite): project info and the starting slow/typical/fast corners,
no stackup, parts, buses or nets yet. Refuses to overwrite an existing file.

  --name TEXT  project name (default: the file name without extension)
  --json       print {"path", "name"}`;

async function run(argv: string[], io: CliIo): Promise<number> {
  const { values, positionals } = parseArgs({
    args: argv,
    strict: true,
    allowPositionals: true,
    options: { name: { type: 'string' }, json: { type: 'boolean', default: false } },
  });
  if (positionals.length !== 1) throw new InputError('FILE', positionals.length === 0 ? 'is required' : 'give exactly one project file');
  const path = positionals[0];
  const name = values.name ?? basename(path).replace(/\.[^.]+$/, '');
  createProject(path, emptyProject(name));
  if (values.json) printJson(io, { path, name });
  else io.out(`Created project "${name}" in ${path}`);
  return 0;
}

export const command: CliCommand = { name: 'new', summary: 'create an empty project file', usage, run };

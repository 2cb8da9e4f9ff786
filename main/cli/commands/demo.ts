/** `slackline demo [--out DIR] [--json]`: writes the invented demo project. */
import { parseArgs } from 'node:util';
import { InputError } from '../../../core/errors.js';
import { createDemoProject } from '../../services/project/demo.js';
import { ProjectStore } from '../../services/project/project-store.js';
import { printJson, type CliCommand, type CliIo } from '../command.js';

const usage = `Usage: slackline demo [--out DIR] [--json]

Creates DIR/demo.slackline (default DIR: ./slackline-demo): an invented board with an 8-layer
stackup, a 64-bit memory data bus in byte lanes with strobes, a fly-by address/command bus with its
clock, and a common-clock local bus; some nets are wrong on purpose so the check shows failures.
An earlier demo project in DIR is replaced.

  --out DIR  folder for the project (created if missing)
  --json     print {"path", "nets", "buses"}`;

async function run(argv: string[], io: CliIo): Promise<number> {
  const { values, positionals } = parseArgs({
    args: argv,
    strict: true,
    allowPositionals: true,
    options: { out: { type: 'string', default: 'slackline-demo' }, json: { type: 'boolean', default: false } },
  });
  if (positionals.length > 0) throw new InputError(`argument "${positionals[0]}"`, 'demo takes no file argument; use --out DIR');
  const path = createDemoProject(values.out);
  const store = ProjectStore.open(path);
  const data = store.load();
  store.close();
  if (values.json) {
    printJson(io, { path, nets: data.nets.length, buses: data.buses.map((b) => b.name) });
  } else {
    io.out(
      `Created the demo project in ${path}\n` +
        `  ${data.nets.length} nets on ${data.buses.length} buses, ${data.stackup.layers.filter((l) => l.kind === 'copper').length} copper layers ` +
        `(invented for the demo)\n  Next: slackline show ${path}`,
    );
  }
  return 0;
}

export const command: CliCommand = { name: 'demo', summary: 'create the demo project (an invented board)', usage, run };

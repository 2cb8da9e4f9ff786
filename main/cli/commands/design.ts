/** `slackline design FILE [--out DESIGN.yaml]`: writes a project's design file (docs/design-file.md). */
import { parseArgs } from 'node:util';
import { InputError } from '../../../core/errors.js';
import { exportDesignFile } from '../../services/compose.js';
import { printJson, type CliCommand, type CliIo } from '../command.js';

const usage = `Usage: slackline design FILE [--out DESIGN.yaml] [--json]

Writes the design file of the project FILE: project, stackup, parts, corners, buses and every net
as an explicit tree, each value with its unit (docs/design-file.md). "slackline new P --from" reads
it back to the same project. Without --out the text goes to standard output.

  --out DESIGN.yaml  write the design file there (replacing an earlier one)
  --json             with --out, print {"path", "out", "bytes"}`;

async function run(argv: string[], io: CliIo): Promise<number> {
  const { values, positionals } = parseArgs({
    args: argv,
    strict: true,
    allowPositionals: true,
    options: { out: { type: 'string' }, json: { type: 'boolean', default: false } },
  });
  if (positionals.length !== 1) throw new InputError('FILE', positionals.length === 0 ? 'is required' : 'give exactly one project file');
  const path = positionals[0];
  const text = exportDesignFile(path, values.out);
  if (values.out === undefined) {
    io.out(text);
  } else if (values.json) {
    printJson(io, { path, out: values.out, bytes: Buffer.byteLength(text, 'utf8') });
  } else {
    io.out(`Wrote the design file of ${path} to ${values.out}`);
  }
  return 0;
}

export const command: CliCommand = { name: 'design', summary: "write a project's design file (YAML)", usage, run };

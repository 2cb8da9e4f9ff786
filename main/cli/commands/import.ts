/** `slackline import FILE LENGTHS.csv [--dry-run] [--json]`: routed lengths into a project. */
import { readFileSync, statSync } from 'node:fs';
import { basename } from 'node:path';
import { parseArgs } from 'node:util';
import { InputError } from '../../../core/errors.js';
import type { ImportPreview, ImportRow } from '../../../core/contract/api.js';
import { summariseImport } from '../../../core/lengths/length-report.js';
import { formatIn } from '../../../core/units/quantity.js';
import { openProjectServices } from '../../services/compose.js';
import { requireReportSize } from '../../services/project/project-store.js';
import { printJson, type CliCommand, type CliIo } from '../command.js';

const usage = `Usage: slackline import FILE LENGTHS.csv [--dry-run] [--json]

Reads a routed-length report (CSV, one row per net segment; columns net, layer, length and
optionally width) into the project FILE. Units go in each value (1250mil, 31.75mm) or in the column
header (length_mil, width_mm). The Nth row of a net on a layer updates the Nth segment of that net on
that layer; rows beyond the net's segments are listed as new and not written, as are rows of nets or
layers the project does not have. The whole file is checked first; with any error nothing is written.

  --dry-run        show what would change; write nothing
  --allow-repeats  accept rows repeating an earlier row's net, layer and length: each sets the
                   next segment of that net on that layer (refused without this flag)
  --json     print the preview (lengths in metres); exit status 2 when it has errors`;

const mmText = (m: number) => formatIn(m, 'mm', 3);
const milText = (m: number) => formatIn(m, 'mil', 1);
const LIST_LIMIT = 25;

function rowLine(row: ImportRow): string {
  const where = `line ${row.line}: ${row.net} on ${row.layer}`;
  if (row.status === 'changed') {
    return `  ${where}: ${row.previous === null ? '?' : mmText(row.previous)} -> ${mmText(row.length)} (${milText(row.length)})`;
  }
  // Rows that write nothing say why (core/lengths/mapping-words.ts).
  const reason = (row as { reason?: string }).reason;
  return `  ${where}: ${mmText(row.length)}${reason && row.status !== 'matched' ? ` — ${reason}` : ''}`;
}

function printPreview(io: CliIo, preview: ImportPreview, dryRun: boolean): void {
  const lines = [summariseImport(preview)];
  const sections: [string, string][] = [
    ['changed', dryRun ? 'Would change:' : 'Changed:'],
    ['new', 'New (no such segment in the topology; not written, add the segment to the net first):'],
    ['unknown-layer', 'Unknown layer (not a copper layer of the stackup; not written):'],
    ['unknown-net', 'Unknown net (not in the project; not written):'],
  ];
  for (const [status, title] of sections) {
    const rows = preview.rows.filter((r) => r.status === status);
    if (rows.length === 0) continue;
    lines.push('', title, ...rows.slice(0, LIST_LIMIT).map(rowLine));
    if (rows.length > LIST_LIMIT) lines.push(`  ... and ${rows.length - LIST_LIMIT} more (--json lists all)`);
  }
  for (const note of preview.notes ?? []) lines.push('', note);
  const rule = (preview as { rule?: string }).rule;
  if (rule) lines.push('', rule);
  const unchanged = (preview.counts.changed ?? 0) === 0;
  lines.push('', dryRun ? 'Dry run: nothing was written.' : preview.applied ? 'Applied in one transaction.' : unchanged ? 'Nothing changed; nothing was written.' : 'Nothing was written.');
  io.out(lines.join('\n'));
}

async function run(argv: string[], io: CliIo): Promise<number> {
  const { values, positionals } = parseArgs({
    args: argv,
    strict: true,
    allowPositionals: true,
    options: {
      'dry-run': { type: 'boolean', default: false }, json: { type: 'boolean', default: false },
      'allow-repeats': { type: 'boolean', default: false },
    },
  });
  if (positionals.length !== 2) throw new InputError('arguments', 'give the project FILE and the LENGTHS.csv report');
  const [projectPath, csvPath] = positionals;
  let csvText: string;
  try {
    // The size limit before reading: a 50 MB file is refused without being loaded.
    requireReportSize(csvPath, statSync(csvPath).size);
    csvText = readFileSync(csvPath, 'utf8');
  } catch (error) {
    if (error instanceof InputError) throw error;
    const code = (error as { code?: string }).code;
    throw new InputError(csvPath, code === 'ENOENT' ? 'file not found' : `cannot be read (${code ?? String(error)})`);
  }
  const services = openProjectServices(projectPath);
  const store = services.store;
  let preview: ImportPreview;
  try {
    const fileName = basename(csvPath);
    const confirm = { allowRepeatedRows: values['allow-repeats'] };
    preview = values['dry-run'] ? store.previewImport(fileName, csvText, confirm) : store.applyImport(fileName, csvText, confirm);
  } finally {
    await services.close();
  }
  if (values.json) printJson(io, preview);
  else if (preview.errors.length === 0) printPreview(io, preview, values['dry-run']);
  if (preview.errors.length > 0) {
    io.err(`slackline import: ${csvPath} has ${preview.errors.length} error(s); nothing was written:\n${preview.errors.map((e) => `  ${e}`).join('\n')}`);
    return 2;
  }
  return 0;
}

export const command: CliCommand = { name: 'import', summary: 'import a routed-length report (CSV) into a project', usage, run };

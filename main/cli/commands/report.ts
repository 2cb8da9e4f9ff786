/**
 * `slackline report FILE --out DIR [--format pdf,html,csv] [--bus NAME] [--json]`: solves the project
 * (results come from the project's cache when its inputs are unchanged) and writes the design-review
 * margin report. Progress goes to stderr so stdout holds only the written paths.
 */
import { existsSync } from 'node:fs';
import { parseArgs } from 'node:util';
import { InputError } from '../../../core/errors.js';
import { openProjectServices } from '../../services/compose.js';
import { parseReportFormats } from '../../services/report/export.js';
import { printJson, type CliCommand, type CliIo } from '../command.js';
import { progressPrinter } from '../progress.js';

const usage = `Usage: slackline report FILE --out DIR [--format pdf,html,csv] [--bus NAME] [--json]

Solves every bus of the project (or only --bus) at every corner and writes the design-review margin
report into DIR: a PDF and a self-contained HTML file (cover with status per bus, stackup, corners,
budgets, margin tables, skew charts, length windows, waveforms of failing and tight nets, and what was
modelled or neglected) and a CSV of the margin tables (one row per net, units in the headers).
Prints the paths written. Exit status 0 when the report was written, whatever the margins say.

  --out DIR      folder for the report files (created if missing)
  --format LIST  comma-separated subset of pdf,html,csv (default: all three)
  --bus NAME     report only this bus
  --json         print {"files": [...], "status": {bus: status}}`;

async function run(argv: string[], io: CliIo): Promise<number> {
  const { values, positionals } = parseArgs({
    args: argv,
    strict: true,
    allowPositionals: true,
    options: {
      out: { type: 'string' },
      format: { type: 'string', default: 'pdf,html,csv' },
      bus: { type: 'string' },
      json: { type: 'boolean', default: false },
    },
  });
  const [file, ...extra] = positionals;
  if (!file) throw new InputError('FILE', 'missing project file');
  if (extra.length) throw new InputError(`argument "${extra[0]}"`, 'report takes one project file');
  if (!values.out) throw new InputError('--out', 'missing output folder (--out DIR)');
  const formats = parseReportFormats(values.format);
  if (!existsSync(file)) throw new InputError(file, 'no such project file');

  const services = openProjectServices(file);
  try {
    const project = services.store.load();
    if (values.bus !== undefined && !project.buses.some((b) => b.name === values.bus)) {
      throw new InputError('--bus', `no bus named "${values.bus}" (buses: ${project.buses.map((b) => b.name).join(', ') || 'none'})`);
    }
    const { board: result, files } = await services.reports.solveAndWrite({
      outDir: values.out, formats, bus: values.bus, onProgress: progressPrinter(io),
    });
    const status = Object.fromEntries(result.buses.filter((b) => values.bus === undefined || b.bus === values.bus).map((b) => [b.bus, b.nets.length ? b.status : 'not evaluated']));
    if (values.json) {
      printJson(io, { files, status });
    } else {
      const summary = Object.entries(status).map(([bus, s]) => `${bus} ${String(s).toUpperCase()}`).join(', ');
      io.out([`Report written (${summary || 'no buses'}):`, ...files.map((f) => `  ${f}`)].join('\n'));
    }
    return 0;
  } finally {
    await services.close();
  }
}

export const command: CliCommand = { name: 'report', summary: 'solve the project and write the margin report (PDF, HTML, CSV)', usage, run, flags: { 'selected bus': '--bus' } };

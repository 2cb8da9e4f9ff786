/**
 * `slackline demo [--out DIR] [--json]`: the main job on the built-in demo board — creates the
 * invented demo project, checks every bus at every corner, and writes the margin report.
 */
import { join } from 'node:path';
import { parseArgs } from 'node:util';
import { InputError } from '../../../core/errors.js';
import { formatIn } from '../../../core/units/quantity.js';
import { createDemo, openProjectServices } from '../../services/compose.js';
import { REPORT_FORMATS } from '../../services/report/export.js';
import { printJson, type CliCommand, type CliIo } from '../command.js';
import { progressPrinter } from '../progress.js';

const usage = `Usage: slackline demo [--out DIR] [--no-report] [--json]

Creates DIR/demo.slackline (default DIR: ./slackline-demo): an invented board with an 8-layer
stackup, a 64-bit memory data bus in byte lanes with strobes, a fly-by address/command bus with its
clock, and a common-clock local bus; some nets are wrong on purpose so the check shows failures.
Then checks every bus at every corner and writes the margin report (PDF, HTML, CSV) to DIR/report.
An earlier demo project in DIR is replaced.

  --out DIR    folder for the project and its report (created if missing)
  --no-report  only create the project
  --json       print {"path", "nets", "buses", "status", "files"}`;

async function run(argv: string[], io: CliIo): Promise<number> {
  const { values, positionals } = parseArgs({
    args: argv,
    strict: true,
    allowPositionals: true,
    options: {
      out: { type: 'string', default: 'slackline-demo' },
      'no-report': { type: 'boolean', default: false },
      json: { type: 'boolean', default: false },
    },
  });
  if (positionals.length > 0) throw new InputError(`argument "${positionals[0]}"`, 'demo takes no file argument; use --out DIR');
  const path = createDemo(values.out);
  const services = openProjectServices(path);
  try {
    const data = services.store.load();
    const lines = [
      `Created the demo project ${path}`,
      `  ${data.nets.length} nets on ${data.buses.length} buses, ${data.stackup.layers.filter((l) => l.kind === 'copper').length} copper layers (invented for the demo)`,
    ];
    if (values['no-report']) {
      if (values.json) printJson(io, { path, nets: data.nets.length, buses: data.buses.map((b) => b.name) });
      else io.out([...lines, `  Next: slackline check ${path}`].join('\n'));
      return 0;
    }
    const { board, files } = await services.reports.solveAndWrite({
      outDir: join(values.out, 'report'), formats: REPORT_FORMATS, onProgress: progressPrinter(io),
    });
    const status = Object.fromEntries(board.buses.map((b) => [b.bus, b.status]));
    if (values.json) {
      printJson(io, { path, nets: data.nets.length, buses: data.buses.map((b) => b.name), status, files });
      return 0;
    }
    const counts = { pass: 0, tight: 0, fail: 0 };
    for (const b of board.buses) for (const n of b.nets) counts[n.status]++;
    lines.push(`Checked every bus at ${data.corners.length} corners: ${counts.pass} nets pass, ${counts.tight} tight, ${counts.fail} fail`);
    for (const b of board.buses) {
      const margins = b.nets.length ? `worst setup ${formatIn(b.worstSetup, 'ps', 0)}, worst hold ${formatIn(b.worstHold, 'ps', 0)}` : 'no nets';
      lines.push(`  ${b.bus.padEnd(10)} ${b.status.toUpperCase().padEnd(5)} ${margins}${b.worstNet && b.status !== 'pass' ? ` (${b.worstNet})` : ''}`);
    }
    lines.push('Report written to:', ...files.map((f) => `  ${f}`), `Margin tables in full: slackline check ${path}`);
    io.out(lines.join('\n'));
    return 0;
  } finally {
    await services.close();
  }
}

export const command: CliCommand = { name: 'demo', summary: 'create the demo board, check it and write its margin report', usage, run };

/** `slackline doctor FILE [--restore] [--json]`: the full integrity check; restore the backup copy. */
import { parseArgs } from 'node:util';
import { InputError } from '../../../core/errors.js';
import { diagnoseProject, restoreProject } from '../../services/db/project-doctor.js';
import { printJson, type CliCommand, type CliIo } from '../command.js';

const usage = `Usage: slackline doctor FILE [--restore] [--json]

Runs SQLite's full integrity check on the project FILE (read-only; the file is not changed) and names
the newest automatic backup copy beside it (FILE.last-good, written before the first edit of each
session, or a copy taken before a schema upgrade).

  --restore  when FILE is damaged: keep it aside as FILE.damaged-<time> and put the backup copy in its place
  --json     print the report

Exit status: 0 sound (or restored), 1 damaged, 2 bad input.`;

async function run(argv: string[], io: CliIo): Promise<number> {
  const { values, positionals } = parseArgs({
    args: argv, strict: true, allowPositionals: true,
    options: { restore: { type: 'boolean', default: false }, json: { type: 'boolean', default: false } },
  });
  if (positionals.length !== 1) throw new InputError('FILE', positionals.length === 0 ? 'is required' : 'give exactly one project file');
  const path = positionals[0];
  const report = diagnoseProject(path);
  if (values.restore && !report.sound) {
    const restored = restoreProject(path);
    if (values.json) printJson(io, { ...report, restored });
    else io.out(`${path}: was damaged (${report.problems[0]}); restored from ${restored.restoredFrom}; the damaged file is kept as ${restored.damagedCopy}`);
    return 0;
  }
  if (values.json) printJson(io, report);
  else if (report.sound) io.out(`${path}: sound (full integrity check ok)${report.backup ? `; newest backup copy: ${report.backup}` : ''}`);
  else {
    const more = report.problems.length > 1 ? ` (and ${report.problems.length - 1} more)` : '';
    const offer = report.backup
      ? report.backupSound
        ? `; the backup copy ${report.backup} is sound: run "slackline doctor ${path} --restore" to put it in place`
        : `; the backup copy ${report.backup} is damaged too`
      : '; there is no automatic backup copy beside it';
    io.out(`${path}: damaged: ${report.problems[0]}${more}${offer}`);
  }
  return report.sound ? 0 : 1;
}

export const command: CliCommand = { name: 'doctor', summary: 'full integrity check of a project file; restore its backup copy', usage, run };

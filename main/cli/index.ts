/**
 * `slackline <command> ...` — the command-line host. It parses arguments, calls the services and
 * prints; it holds no business logic. Exit status (docs/reliability.md §4): 0 ok, 1 a check failed,
 * 2 bad input or usage (including a project that is busy, damaged or read-only), 70 a failure of the
 * program itself (one line on stderr naming the file that holds the details).
 */
import { writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { InputError } from '../../core/errors.js';
import type { CliCommand, CliIo } from './command.js';

/** Exit statuses of every command. 70 is EX_SOFTWARE of BSD sysexits(3), "internal software error". */
export const EXIT = { ok: 0, checkFailed: 1, badInput: 2, internal: 70 } as const;

/**
 * Command name -> its module under ./commands/, loaded on first use (a command's dependencies, such as
 * the database driver, load only when it runs). Each loader names its module, so the layering lint
 * and the bundler can see every import.
 */
const COMMAND_LOADERS: Record<string, () => Promise<{ command: CliCommand }>> = {
  z0: () => import('./commands/z0.js'),
  stackup: () => import('./commands/stackup.js'),
  sim: () => import('./commands/sim.js'),
  ibis: () => import('./commands/ibis.js'),
  new: () => import('./commands/new.js'),
  design: () => import('./commands/design.js'),
  import: () => import('./commands/import.js'),
  show: () => import('./commands/show.js'),
  demo: () => import('./commands/demo.js'),
  check: () => import('./commands/check.js'),
  sweep: () => import('./commands/sweep.js'),
  report: () => import('./commands/report.js'),
  doctor: () => import('./commands/doctor.js'),
};
const COMMANDS = Object.keys(COMMAND_LOADERS);

const consoleIo: CliIo = {
  out: (text) => process.stdout.write(text.endsWith('\n') ? text : `${text}\n`),
  err: (text) => process.stderr.write(text.endsWith('\n') ? text : `${text}\n`),
};

async function load(name: string): Promise<CliCommand | null> {
  const loader = Object.hasOwn(COMMAND_LOADERS, name) ? COMMAND_LOADERS[name] : undefined;
  return loader ? (await loader()).command : null;
}

async function help(io: CliIo): Promise<number> {
  const lines = ['Usage: slackline <command> [options]   (every command takes --json)', '', 'Commands:'];
  for (const name of COMMANDS) {
    const command = await load(name).catch(() => null);
    if (command) lines.push(`  ${name.padEnd(9)} ${command.summary}`);
  }
  io.out(lines.join('\n'));
  return 0;
}

/**
 * A driver error about the project file that escaped the services (they translate their own):
 * busy, damaged, read-only or full, as one line. Null for anything else.
 */
function fileProblem(error: unknown): string | null {
  const code = (error as { code?: unknown } | null)?.code;
  if (typeof code !== 'string' || !code.startsWith('SQLITE_')) return null;
  if (/^SQLITE_(BUSY|LOCKED)/.test(code)) return 'the project is in use by another process; nothing was written — try again when it is done';
  if (/^SQLITE_(CORRUPT|NOTADB)/.test(code)) return 'the project file is damaged; run "slackline doctor FILE" for the full check and the backup copy';
  if (/^SQLITE_READONLY/.test(code)) return 'the project is read-only; the change was refused';
  if (/^SQLITE_FULL/.test(code)) return 'the disk is full; the change was rolled back';
  return null;
}

/** Writes the details of an internal failure to a file and returns its path (null if even that fails). */
function writeDetails(name: string, argv: readonly string[], error: unknown): string | null {
  const path = join(tmpdir(), `slackline-error-${new Date().toISOString().replace(/[:.]/g, '-')}-${process.pid}.txt`);
  const stack = error instanceof Error ? (error.stack ?? error.message) : String(error);
  try {
    writeFileSync(path, `slackline ${name} ${argv.join(' ')}\nnode ${process.version}\n\n${stack}\n`);
    return path;
  } catch {
    return null;
  }
}

/** One line for a failure of the program itself; the stack goes to a file, never to the terminal. */
function internalFailure(io: CliIo, name: string, argv: readonly string[], error: unknown): number {
  const details = writeDetails(name, argv, error);
  const message = (error instanceof Error ? error.message : String(error)).split('\n')[0].slice(0, 300);
  io.err(
    `slackline ${name}: internal error: ${message} — this is a fault in slackline, not in your input; ` +
      (details ? `details are in ${details}` : 'the details could not be written to a file'),
  );
  return EXIT.internal;
}

/**
 * Runs one command. Never throws: every outcome is an exit status from EXIT. If the command's work
 * stops without settling (a promise nobody will resolve, which Node would end with status 13), the
 * process still ends with one line and EXIT.internal.
 */
export async function main(argv: string[], io: CliIo = consoleIo): Promise<number> {
  return guardedRun(argv, io, () => dispatch(argv, io));
}

/**
 * Runs `work` under the exit-status contract: a throw becomes EXIT.internal with one line, and work
 * that stops without settling (the event loop empties while it is pending) ends the process with
 * one line and EXIT.internal instead of Node's 13. Exported for the test of that guard.
 */
export async function guardedRun(argv: readonly string[], io: CliIo, work: () => Promise<number>): Promise<number> {
  let settled = false;
  const unsettled = (): void => {
    if (settled) return;
    io.err(`slackline ${argv[0] ?? ''}: internal error: the command stopped before finishing (a fault in slackline); nothing more will happen`);
    process.exit(EXIT.internal);
  };
  process.once('beforeExit', unsettled);
  try {
    return await work();
  } catch (error) {
    return internalFailure(io, argv[0] ?? '', argv.slice(1), error);
  } finally {
    settled = true;
    process.removeListener('beforeExit', unsettled);
  }
}

async function dispatch(argv: string[], io: CliIo): Promise<number> {
  const [name, ...rest] = argv;
  if (!name || name === 'help' || name === '--help' || name === '-h') return help(io);
  const command = await load(name);
  if (!command) {
    io.err(`slackline: unknown command "${name}". Run "slackline help" for the list.`);
    return 2;
  }
  if (rest.includes('--help') || rest.includes('-h')) {
    io.out(command.usage);
    return 0;
  }
  try {
    return await command.run(rest, io);
  } catch (error) {
    if (error instanceof InputError) {
      const flag = command.flags?.[error.where];
      io.err(`slackline ${name}: ${flag ? `${flag}: ${error.reason}` : error.message}`);
      return 2;
    }
    if (error instanceof Error && 'code' in error && String((error as { code: unknown }).code).startsWith('ERR_PARSE_ARGS')) {
      io.err(`slackline ${name}: ${error.message}\n\n${command.usage}`);
      return 2;
    }
    const problem = fileProblem(error);
    if (problem) {
      io.err(`slackline ${name}: ${problem}`);
      return EXIT.badInput;
    }
    return internalFailure(io, name, rest, error);
  }
}

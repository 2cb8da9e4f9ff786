import { existsSync } from 'node:fs';
import { InputError } from '../../core/errors.js';
/** What every CLI command module exports as `command`. */
export interface CliIo {
  out(text: string): void;
  err(text: string): void;
}

export interface CliCommand {
  name: string;
  /** One line for `slackline help`. */
  summary: string;
  /** Usage text shown with --help and on bad arguments. */
  usage: string;
  /** Core field names (InputError.where) this command's flags stand for, e.g. 'selected bus' -> '--bus'. */
  flags?: Readonly<Record<string, string>>;
  /** Returns the exit status: 0 ok, 1 a check failed, 2 bad input. */
  run(argv: string[], io: CliIo): Promise<number>;
}

/** Prints a value as JSON (SI units) on one line per document, for --json. */
export function printJson(io: CliIo, value: unknown): void {
  io.out(JSON.stringify(value, null, 2));
}

/** The one project FILE a command takes, which must exist; refusals name the argument (exit 2). */
export function projectFileArgument(positionals: readonly string[], usage: string): string {
  if (positionals.length !== 1) throw new InputError('arguments', `expected one project FILE, got ${positionals.length}\n\n${usage}`);
  const path = positionals[0];
  if (!existsSync(path)) throw new InputError(path, 'no such project file');
  return path;
}

/**
 * `slackline <command> ...` — the command-line host. It parses arguments, calls the services and
 * prints; it holds no business logic. Exit status: 0 ok, 1 a check failed, 2 bad input or usage.
 */
import { InputError } from '../../core/errors.js';
import type { CliCommand, CliIo } from './command.js';

/**
 * Command name -> its module under ./commands/, loaded on first use (a command's dependencies, such as
 * the database driver, load only when it runs). Each loader names its module, so the layering lint
 * and the bundler can see every import.
 */
const COMMAND_LOADERS: Record<string, () => Promise<{ command: CliCommand }>> = {
  z0: () => import('./commands/z0.js'),
  stackup: () => import('./commands/stackup.js'),
  sim: () => import('./commands/sim.js'),
  new: () => import('./commands/new.js'),
  design: () => import('./commands/design.js'),
  import: () => import('./commands/import.js'),
  show: () => import('./commands/show.js'),
  demo: () => import('./commands/demo.js'),
  check: () => import('./commands/check.js'),
  report: () => import('./commands/report.js'),
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

export async function main(argv: string[], io: CliIo = consoleIo): Promise<number> {
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
    throw error;
  }
}

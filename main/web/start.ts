/**
 * `npm run web [-- project.slackline] [--port N] [--read-only]`: serves the workbench on 127.0.0.1 and prints the
 * address to open (with this run's access token). Without a project it opens the demo project,
 * creating it in the system's temp folder the first time. `--read-only` opens the project read-only
 * (docs/workbench.md, "Read-only projects").
 */
import { parseArgs } from 'node:util';
import { existsSync } from 'node:fs';
import { join } from 'node:path';
import { InputError } from '../../core/errors.js';
import { DEFAULT_RENDERER_DIR, serveProject } from './serve-project.js';

async function main(): Promise<number> {
  const { values, positionals } = parseArgs({
    args: process.argv.slice(2),
    options: { port: { type: 'string' }, 'read-only': { type: 'boolean' } },
    allowPositionals: true,
  });
  const port = values.port === undefined ? 0 : Number(values.port);
  if (!Number.isInteger(port) || port < 0 || port > 65535) {
    console.error(`slackline web: --port must be a whole number from 0 to 65535, got "${values.port}"`);
    return 2;
  }
  if (!existsSync(join(DEFAULT_RENDERER_DIR, 'index.html'))) {
    console.error('slackline web: the renderer is not built yet; run "npm run build:renderer" (npm run web does it for you).');
    return 2;
  }
  const served = await serveProject({ projectPath: positionals[0], port, readOnly: values['read-only'] === true });
  console.log(`Slackline workbench serving ${served.projectPath}${served.workbench.readOnly ? ` (read-only: ${served.workbench.readOnly})` : ''}`);
  console.log(`Open ${served.shell.url}`);
  console.log('Only this machine can connect (127.0.0.1); the token in the address is new for every run. Ctrl+C stops.');
  const stop = () => {
    void served.close().finally(() => process.exit(0));
  };
  process.once('SIGINT', stop);
  process.once('SIGTERM', stop);
  return -1;
}

main().then(
  (status) => {
    if (status >= 0) process.exit(status);
  },
  (error: unknown) => {
    console.error(`slackline web: ${error instanceof InputError || error instanceof Error ? error.message : String(error)}`);
    process.exit(error instanceof InputError ? 2 : 1);
  },
);

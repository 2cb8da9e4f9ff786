/**
 * `npm run bench`: runs every bench/*.bench.ts in file-name order, calling its exported `run()`.
 * Benchmarks print their own numbers; a failing benchmark stops the run with exit status 1.
 */
import { readdirSync } from 'node:fs';
import { dirname, join } from 'node:path';
import { fileURLToPath, pathToFileURL } from 'node:url';

const here = dirname(fileURLToPath(import.meta.url));
const only = process.argv.slice(2);
const files = readdirSync(here)
  .filter((name) => name.endsWith('.bench.ts'))
  .filter((name) => only.length === 0 || only.some((o) => name.includes(o)))
  .sort();

for (const file of files) {
  console.log(`\n== ${file}`);
  const module = (await import(pathToFileURL(join(here, file)).href)) as { run?: () => unknown };
  if (typeof module.run !== 'function') {
    console.error(`${file} exports no run()`);
    process.exitCode = 1;
    continue;
  }
  await module.run();
}

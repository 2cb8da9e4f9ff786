/**
 * The prebuilt command-line bundle (scripts/build-cli.mjs) starts each worker thread as
 * `new URL('./NAME.mjs', import.meta.url)` from whichever chunk code splitting put the starting module
 * in. A worker file missing beside that chunk would not fail anything: its work would run on the
 * command's thread, one core only, unnoticed. This builds the bundle into a temporary folder and checks,
 * in the emitted code, that every worker the chunks start sits beside the chunk that starts it.
 * Common practice, no source.
 */
import { afterAll, describe, expect, it } from 'vitest';
import { existsSync, mkdtempSync, readdirSync, readFileSync, rmSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { basename, dirname, join } from 'node:path';
import { buildCli } from '../../../scripts/build-cli.mjs';

const dir = mkdtempSync(join(tmpdir(), 'slackline-cli-bundle-'));
afterAll(() => rmSync(dir, { recursive: true, force: true }));

function jsFiles(folder: string): string[] {
  return readdirSync(folder, { withFileTypes: true }).flatMap((e) =>
    e.isDirectory() ? jsFiles(join(folder, e.name)) : e.name.endsWith('.js') ? [join(folder, e.name)] : []);
}

describe('the prebuilt CLI bundle', () => {
  it('puts every worker-thread entry beside the chunk that starts it', async () => {
    const out = join(dir, 'cli');
    const built = await buildCli(out);
    const started = new Map<string, string>(); // worker file -> chunk starting it
    for (const file of jsFiles(out)) {
      for (const m of readFileSync(file, 'utf8').matchAll(/new URL\(\s*["'`]\.\/([\w-]+\.mjs)["'`]\s*,\s*import\.meta\.url\s*\)/g)) {
        started.set(join(dirname(file), m[1]), file);
      }
    }
    // the solver's pool, the cross-section worker and the report's chart drawing
    expect([...started.keys()].map((f) => basename(f)).sort()).toEqual(['chart-worker.mjs', 'lines-worker.mjs', 'solve-worker.mjs']);
    for (const [worker, chunk] of started) {
      expect(existsSync(worker), `${basename(worker)} beside ${basename(chunk)}`).toBe(true);
    }
    expect(built.workers.map((w) => basename(w)).sort()).toEqual(['chart-worker.mjs', 'lines-worker.mjs', 'solve-worker.mjs']);
  }, 120_000);
});

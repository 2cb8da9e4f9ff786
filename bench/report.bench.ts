/**
 * Report export at board scale: `slackline report FILE --out DIR` (PDF, HTML and CSV, as a user runs
 * it) on generated boards (bench/generate-board.ts, the demo's linear part models) that were checked
 * first, so the report reads stored results and simulates only the waveforms it draws (one per failing
 * or tight net). Through the prebuilt CLI bundle in a child process (bench/cli-run.ts), timed in wall
 * and CPU time. The reference measured in the same run is the fixed cost of a report: the same command
 * on a checked 2-net board, subtracted before the growth exponent b of time ~ nets^b is fitted
 * (b = 1 is linear in nets).
 *
 * Sizes: SLACKLINE_REPORT_SIZES (default "100,300,1000").
 */
import { mkdtempSync, readdirSync, rmSync, statSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { generateBoard } from './generate-board.js';
import { bundleFresh, cli, growthExponent } from './cli-run.js';
import { ProjectStore } from '../main/services/project/project-store.js';
import { buildCli } from '../scripts/build-cli.mjs';

/** A checked board of `nets` nets in `dir`: its path. */
function checkedBoard(dir: string, nets: number): string {
  const path = join(dir, `board-${nets}.slackline`);
  ProjectStore.create(path, generateBoard(nets)).close();
  cli(['check', path]);
  return path;
}

/** One report of `path` into a fresh folder: wall and CPU time, s, and the bytes written. */
function report(path: string, out: string): { wall: number; cpu: number; bytes: number } {
  rmSync(out, { recursive: true, force: true });
  const t = cli(['report', path, '--out', out]);
  const bytes = readdirSync(out).reduce((sum, f) => sum + statSync(join(out, f)).size, 0);
  return { ...t, bytes };
}

export async function run(): Promise<void> {
  const sizes = (process.env.SLACKLINE_REPORT_SIZES ?? '100,300,1000').split(',').map(Number);
  let built = 'fresh';
  if (!bundleFresh()) {
    await buildCli();
    built = 'built for this run (missing or older than its sources)';
  }
  console.log(`report: PDF + HTML + CSV of checked generated boards of ${sizes.join(', ')} nets (the demo's linear part models); CLI bundle ${built}`);
  const dir = mkdtempSync(join(tmpdir(), 'slackline-report-bench-'));
  try {
    const tiny = checkedBoard(dir, 2);
    const fixed = Math.min(...[0, 1].map(() => report(tiny, join(dir, 'out-2')).wall));
    console.log(`  reference: fixed cost of a report (checked 2-net board) ${fixed.toFixed(2)} s`);
    const rows: { nets: number; wall: number }[] = [];
    for (const nets of sizes) {
      const path = checkedBoard(dir, nets);
      const r = report(path, join(dir, `out-${nets}`));
      rows.push({ nets, wall: r.wall });
      console.log(`  ${String(nets).padStart(5)} nets: ${r.wall.toFixed(2)} s wall, CPU ${r.cpu.toFixed(2)} s, ${(r.bytes / 1e6).toFixed(1)} MB written`);
      rmSync(path, { force: true });
    }
    const work = rows.map((r) => r.wall - fixed);
    if (rows.length >= 2 && work.every((w) => w > 0.01)) {
      console.log(`  growth exponent over ${rows[0].nets}..${rows[rows.length - 1].nets} nets (time beyond the fixed cost ~ nets^b): b = ${growthExponent(rows.map((r) => r.nets), work).toFixed(2)}`);
    }
    const at1000 = rows.find((r) => r.nets === 1000);
    if (at1000) console.log(`  1,000 nets against the target: ${at1000.wall.toFixed(2)} s (target 5 s) -> ${at1000.wall < 5 ? 'meets it' : 'MISSES it'}`);
  } finally {
    rmSync(dir, { recursive: true, force: true });
  }
}

/**
 * Workbench at board scale (docs/workbench.md, "Board scale"): a generated board (bench/generate-board.ts,
 * the demo's linear models; SLACKLINE_WORKBENCH_NETS nets, default 5000) is solved once, then the
 * messages the workbench sends are timed through dispatch as the hosts call them, with the size of
 * each answer as JSON: opening the project, getProject (first after opening, then warm), the board
 * summary (the overview's first table) and one bus's results page. References measured in the same
 * run: reading the whole project file's bytes, and getResults (the whole board in one message, what
 * the overview loaded before the summary existed).
 */
import { mkdtempSync, readFileSync, rmSync, statSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { generateBoard } from './generate-board.js';
import { createProject, openProjectServices, openWorkbench } from '../main/services/compose.js';
import { dispatchApiCall } from '../main/services/api/dispatch.js';
import { ProjectStore } from '../main/services/project/project-store.js';
import type { BoardSummary } from '../core/contract/api.js';

async function timed(api: Parameters<typeof dispatchApiCall>[0], method: string, args: unknown[] = []): Promise<{ ms: number; bytes: number; value: unknown }> {
  const t0 = performance.now();
  const outcome = await dispatchApiCall(api, method, args);
  const text = JSON.stringify(outcome); // what the loopback shell writes
  const ms = performance.now() - t0;
  if (!outcome.ok) throw new Error(`${method}: ${outcome.error.message}`);
  return { ms, bytes: text.length, value: outcome.value };
}

const mb = (bytes: number) => `${(bytes / 1e6).toFixed(2)} MB`;

export async function run(): Promise<void> {
  const nets = Number(process.env.SLACKLINE_WORKBENCH_NETS ?? 5000);
  const dir = mkdtempSync(join(tmpdir(), 'slackline-workbench-scale-'));
  try {
    const path = join(dir, 'board.slackline');
    createProject(path, generateBoard(nets), { author: 'bench' });
    const solving = openProjectServices(path);
    const t0 = performance.now();
    try {
      await solving.solver.solveBoard({});
    } finally {
      await solving.close();
    }
    console.log(`workbench scale: generated board of ${nets} nets (linear models), solved once in ${((performance.now() - t0) / 1000).toFixed(1)} s; file ${mb(statSync(path).size)}`);

    let t = performance.now();
    readFileSync(path);
    const readFile = performance.now() - t;
    t = performance.now();
    ProjectStore.open(path).close();
    const open = performance.now() - t;
    t = performance.now();
    const workbench = await openWorkbench(path);
    const openWb = performance.now() - t;
    try {
      const first = await timed(workbench.api, 'getProject');
      const warm = await timed(workbench.api, 'getProject');
      const summary = await timed(workbench.api, 'getBoardSummary');
      const buses = (summary.value as BoardSummary).buses;
      const biggest = buses.reduce((a, b) => (b.nets > a.nets ? b : a));
      const page = await timed(workbench.api, 'getBusResults', [biggest.bus]);
      const whole = await timed(workbench.api, 'getResults');
      console.log(`  reference: read the whole file ${readFile.toFixed(0)} ms; getResults (the whole board in one message) ${whole.ms.toFixed(0)} ms, ${mb(whole.bytes)}`);
      console.log(`  open the project file ${open.toFixed(0)} ms (ProjectStore.open: integrity or quick check), the workbench's services ${openWb.toFixed(0)} ms`);
      console.log(`  getProject first after opening ${first.ms.toFixed(0)} ms, warm ${warm.ms.toFixed(0)} ms (${mb(warm.bytes)}; target 200 ms)`);
      console.log(`  overview's first table: getProject + getBoardSummary ${(first.ms + summary.ms).toFixed(0)} ms (summary ${summary.ms.toFixed(0)} ms, ${mb(summary.bytes)}, ${buses.length} buses; target 1 s);` +
        ` summary is ${(whole.bytes / summary.bytes).toFixed(0)}x smaller than getResults`);
      console.log(`  one bus's results (${biggest.bus}, ${biggest.nets} nets) ${page.ms.toFixed(0)} ms, ${mb(page.bytes)}`);
    } finally {
      await workbench.close();
    }
  } finally {
    rmSync(dir, { recursive: true, force: true });
  }
}

/**
 * Board-scale check (generated boards, bench/generate-board.ts: 3 corners, both edges, length windows
 * and termination suggestions): through the real command line on a project file, as a user runs it,
 *   cold     `slackline check` on an empty results store, as a user runs it (defaultCheckThreads:
 *            below three cores, up to 3,000 jobs in the command's own thread, else the pool), and
 *            the same on a copy with the other choice (`--threads 0` where the default takes the
 *            pool, else the pool on every core), so the bench shows what the default gains,
 *   cached   the same check again (nothing changed),
 *   edit     a one-net length change, then the check,
 * at each board size, with the cost per net and the growth exponent b of time ~ nets^b (least squares
 * on log-log; b = 1 is linear). The reference measured in the same run is the fixed cost of a check:
 * the cached check of a 2-net board (start-up, opening the file, printing), subtracted before fitting.
 *
 * The boards are generated from the demo's linear part models (fixtures/demo/demo-project.ts
 * buildLinearDemoProject), the board the first board-scale figures were measured on; one line repeats
 * the check on a board of the demo as it ships (IBIS models for its memory parts) for comparison. The
 * simulations per net (every (corner, edge) case simulated, searches included) are counted in this
 * process on the smallest board (SolveService.lastStats).
 *
 * The CLI runs the prebuilt bundle (out/main/cli, as bin/slackline.mjs runs it when fresh): it is built
 * at the start of the run when missing or older than its sources (the tree may be edited meanwhile; the
 * run keeps the bundle it started with).
 *
 * Sizes: SLACKLINE_BOARD_SIZES (default "100,300,1000"; the growth range is 100..5000, e.g.
 * SLACKLINE_BOARD_SIZES=100,300,1000,3000,5000, which takes minutes on two cores). IBIS board:
 * SLACKLINE_IBIS_BOARD_NETS (default 300; 0 leaves it out).
 */
import { mkdtempSync, rmSync, statSync } from 'node:fs';
import { availableParallelism, tmpdir } from 'node:os';
import { join } from 'node:path';
import { bundleFresh, cli, growthExponent } from './cli-run.js';
import { generateBoard, type GeneratedModels } from './generate-board.js';
import { memoryStore } from './memory-store.js';
import { ProjectStore } from '../main/services/project/project-store.js';
import { SolveService } from '../main/services/solve/solve-service.js';
import { defaultCheckThreads } from '../main/cli/commands/check.js';
import { buildCli } from '../scripts/build-cli.mjs';

/** The thread count `slackline check` does not choose for a board of `nets` nets here (the comparison run). */
function otherThreads(nets: number): string {
  const choice = defaultCheckThreads(availableParallelism());
  // a board's jobs: one per net and one more per strobe or clock (about 1.09 per net on these boards)
  const inThread = choice.inThreadUpTo !== undefined && nets * 1.09 <= choice.inThreadUpTo;
  return inThread ? String(availableParallelism()) : '0';
}
function lengthEdit(path: string, delta: number): void {
  const store = ProjectStore.open(path);
  try {
    const net = store.load().nets[3];
    const index = net.elements.findIndex((e) => e.kind === 'segment');
    const segment = net.elements[index];
    if (segment.kind === 'segment') store.updateNetElement(net.name, index, { ...segment, length: segment.length + delta });
  } finally {
    store.close();
  }
}

type Row = { nets: number; cold: number; coldCpu: number; coldOther: number; coldOtherCpu: number; cached: number; cachedCpu: number; edit: number; editCpu: number; bytes: number; bytesAfter: number };

/** Cold, cached and one-net-edit checks of one generated board through the CLI. */
function measureBoard(dir: string, nets: number, models: GeneratedModels): Row {
  const path = join(dir, `board-${models}-${nets}.slackline`);
  ProjectStore.create(path, generateBoard(nets, 1, { models })).close();
  const inThreadPath = join(dir, `board-${models}-${nets}-in-thread.slackline`);
  ProjectStore.create(inThreadPath, generateBoard(nets, 1, { models })).close();
  try {
    // the same cold check with the thread count the default does not choose: what the default gains here
    const coldOther = cli(['check', inThreadPath, '--threads', otherThreads(nets)]);
    const cold = cli(['check', path]);
    const bytes = statSync(path).size;
    const cachedRuns = [cli(['check', path]), cli(['check', path])];
    const edits: { wall: number; cpu: number }[] = [];
    for (let k = 1; k <= 3; k++) {
      lengthEdit(path, 1e-4 * k);
      edits.push(cli(['check', path]));
    }
    const best = (runs: { wall: number; cpu: number }[]) => runs.reduce((x, y) => (y.wall < x.wall ? y : x));
    return {
      nets, cold: cold.wall, coldCpu: cold.cpu, coldOther: coldOther.wall, coldOtherCpu: coldOther.cpu, cached: best(cachedRuns).wall, cachedCpu: best(cachedRuns).cpu,
      edit: best(edits).wall, editCpu: best(edits).cpu, bytes, bytesAfter: statSync(path).size,
    };
  } finally {
    rmSync(path, { force: true });
    rmSync(inThreadPath, { force: true });
  }
}

function rowText(row: Row): string {
  return `${String(row.nets).padStart(5)} nets: cold ${row.cold.toFixed(2)} s (CPU ${row.coldCpu.toFixed(2)} s, ${((1000 * row.coldCpu) / row.nets).toFixed(2)} ms CPU per net;` +
    ` with --threads ${otherThreads(row.nets)} ${row.coldOther.toFixed(2)} s, CPU ${row.coldOtherCpu.toFixed(2)} s),` +
    ` cached ${row.cached.toFixed(3)} s (CPU ${row.cachedCpu.toFixed(2)} s), one-net edit ${row.edit.toFixed(3)} s (CPU ${row.editCpu.toFixed(2)} s, best of 3);` +
    ` file ${(row.bytes / 1e6).toFixed(1)} MB after the first check, ${(row.bytesAfter / 1e6).toFixed(1)} MB after 3 edits`;
}

/** Simulations per net of a whole-board check in this thread (every case simulated, searches included). */
async function simulationsPerNet(nets: number, models: GeneratedModels): Promise<number> {
  const service = new SolveService(memoryStore(generateBoard(nets, 1, { models })), { workers: 0 });
  await service.solveBoardSync();
  return service.lastStats.simulations / nets;
}

export async function run(): Promise<void> {
  const sizes = (process.env.SLACKLINE_BOARD_SIZES ?? '100,300,1000').split(',').map(Number);
  const ibisNets = Number(process.env.SLACKLINE_IBIS_BOARD_NETS ?? 300);
  const dir = mkdtempSync(join(tmpdir(), 'slackline-board-scale-'));
  let built = 'fresh';
  if (!bundleFresh()) {
    await buildCli();
    built = 'built for this run (missing or older than its sources)';
  }
  console.log(
    `board scale: generated boards of ${sizes.join(', ')} nets on the demo's linear part models (buildLinearDemoProject,` +
      ` as the earlier figures); ${availableParallelism()} cores (check's default: ${JSON.stringify(defaultCheckThreads(availableParallelism()))}); CLI runs the prebuilt bundle out/main/cli (${built})`,
  );
  const smallest = Math.min(...sizes);
  console.log(
    `  simulations per net (in this thread, ${smallest}-net board): ${(await simulationsPerNet(smallest, 'linear')).toFixed(1)} on linear models,` +
      ` ${(await simulationsPerNet(smallest, 'ibis')).toFixed(1)} on the IBIS demo`,
  );
  const tiny = join(dir, 'board-2.slackline');
  ProjectStore.create(tiny, generateBoard(2)).close();
  cli(['check', tiny]);
  const startup = Math.min(...[0, 1, 2].map(() => cli(['check', tiny]).wall));
  console.log(`  reference: fixed cost of a check (cached check of a 2-net board) ${startup.toFixed(3)} s`);
  const rows: Row[] = [];
  try {
    for (const nets of sizes) {
      const row = measureBoard(dir, nets, 'linear');
      rows.push(row);
      console.log(`  ${rowText(row)}`);
    }
    if (ibisNets >= 2) console.log(`  IBIS board (the demo as it ships, IBIS models for its memory parts): ${rowText(measureBoard(dir, ibisNets, 'ibis'))}`);
  } finally {
    rmSync(dir, { recursive: true, force: true });
  }
  if (rows.length >= 2) {
    const n = rows.map((r) => r.nets);
    // growth of the work beyond the fixed cost; a board whose time is within the fixed cost's own
    // spread has no such work to fit (a clamped value would make the exponent mean nothing)
    const beyond = (times: number[]): string => {
      const work = times.map((t) => t - startup);
      return work.every((w) => w > 0.01) ? growthExponent(n, work).toFixed(2) : 'n/a (within the fixed cost at the smallest board)';
    };
    console.log(
      `  growth exponent over ${n[0]}..${n[n.length - 1]} nets (time beyond the fixed cost ~ nets^b):` +
        ` cold CPU b = ${growthExponent(n, rows.map((r) => r.coldCpu)).toFixed(2)},` +
        ` cold wall b = ${beyond(rows.map((r) => r.cold))},` +
        ` cached b = ${beyond(rows.map((r) => r.cached))},` +
        ` edit b = ${beyond(rows.map((r) => r.edit))}`,
    );
  }
  const at1000 = rows.find((r) => r.nets === 1000);
  if (at1000) {
    console.log(
      `  1,000 nets against the targets: cold ${at1000.cold.toFixed(2)} s (target 3 s), cached ${at1000.cached.toFixed(3)} s (0.5 s),` +
        ` one-net edit ${at1000.edit.toFixed(3)} s (0.5 s)`,
    );
  }
}

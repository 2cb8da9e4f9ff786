/**
 * Board-scale check (generated boards, bench/generate-board.ts: 3 corners, both edges, length windows
 * and termination suggestions): through the real command line on a project file, as a user runs it,
 *   cold     `slackline check` on an empty results store (the worker pool on every core),
 *   cached   the same check again (nothing changed),
 *   edit     a one-net length change, then the check,
 * at each board size, with the cost per net and the growth exponent b of time ~ nets^b (least squares
 * on log-log; b = 1 is linear). The reference measured in the same run is the fixed cost of a check:
 * the cached check of a 2-net board (start-up, opening the file, printing), subtracted before fitting. Which CLI runs is printed: the prebuilt bundle (`npm run build:cli`)
 * when it is fresh, else the TypeScript sources through tsx.
 *
 * Sizes: SLACKLINE_BOARD_SIZES (default "100,300,1000"; the growth range is 100..5000, e.g.
 * SLACKLINE_BOARD_SIZES=100,300,1000,3000,5000, which takes minutes on two cores).
 */
import { execFileSync } from 'node:child_process';
import { existsSync, mkdtempSync, readFileSync, rmSync, statSync } from 'node:fs';
import { availableParallelism, tmpdir } from 'node:os';
import { join } from 'node:path';
import { fileURLToPath } from 'node:url';
import { generateBoard } from './generate-board.js';
import { ProjectStore } from '../main/services/project/project-store.js';

const bin = fileURLToPath(new URL('../bin/slackline.mjs', import.meta.url));
const root = fileURLToPath(new URL('..', import.meta.url));

function bundleState(): string {
  const inputs = join(root, 'out', 'main', 'cli', 'inputs.json');
  if (!existsSync(inputs)) return 'TypeScript sources through tsx (no bundle: npm run build:cli)';
  const { builtAt, inputs: files } = JSON.parse(readFileSync(inputs, 'utf8')) as { builtAt: number; inputs: string[] };
  const stale = files.some((f) => !existsSync(join(root, f)) || statSync(join(root, f)).mtimeMs > builtAt);
  return stale ? 'TypeScript sources through tsx (the bundle is older than the sources)' : 'the prebuilt bundle (out/main/cli)';
}

/** Wall time of one CLI run, s, and its CPU time (user + system of the child), s. */
function cli(args: string[]): { wall: number; cpu: number } {
  const t0 = performance.now();
  const cpu0 = childCpu();
  try {
    execFileSync(process.execPath, [bin, ...args], { stdio: 'ignore' });
  } catch (error) {
    const status = (error as { status?: number }).status;
    if (status !== 1) throw error; // 1: some net fails (the generated board fails by design)
  }
  return { wall: (performance.now() - t0) / 1000, cpu: childCpu() - cpu0 };
}

/** CPU seconds of every child process that has ended so far (this process's own usage excluded). */
function childCpu(): number {
  // process.resourceUsage() is this process only; /proc/self/stat fields 16-17 are the children's
  // user and system clock ticks (proc(5)), at 100 ticks per second on Linux.
  const fields = readFileSync('/proc/self/stat', 'utf8').split(') ')[1].split(' ');
  return (Number(fields[13]) + Number(fields[14])) / 100;
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

/** Least-squares slope of log(y) against log(x). */
function growthExponent(x: number[], y: number[]): number {
  const lx = x.map(Math.log);
  const ly = y.map(Math.log);
  const mx = lx.reduce((a, b) => a + b, 0) / lx.length;
  const my = ly.reduce((a, b) => a + b, 0) / ly.length;
  let num = 0;
  let den = 0;
  for (let i = 0; i < lx.length; i++) {
    num += (lx[i] - mx) * (ly[i] - my);
    den += (lx[i] - mx) ** 2;
  }
  return num / den;
}

export async function run(): Promise<void> {
  const sizes = (process.env.SLACKLINE_BOARD_SIZES ?? '100,300,1000').split(',').map(Number);
  const dir = mkdtempSync(join(tmpdir(), 'slackline-board-scale-'));
  console.log(`board scale: generated boards of ${sizes.join(', ')} nets; ${availableParallelism()} cores; CLI runs ${bundleState()}`);
  const tiny = join(dir, 'board-2.slackline');
  ProjectStore.create(tiny, generateBoard(2)).close();
  cli(['check', tiny]);
  const startup = Math.min(...[0, 1, 2].map(() => cli(['check', tiny]).wall));
  console.log(`  reference: fixed cost of a check (cached check of a 2-net board) ${startup.toFixed(3)} s`);
  const rows: { nets: number; cold: number; coldCpu: number; cached: number; cachedCpu: number; edit: number; editCpu: number; bytes: number; bytesAfter: number }[] = [];
  try {
    for (const nets of sizes) {
      const path = join(dir, `board-${nets}.slackline`);
      ProjectStore.create(path, generateBoard(nets)).close();
      const cold = cli(['check', path]);
      const bytes = statSync(path).size;
      const cachedRuns = [cli(['check', path]), cli(['check', path])];
      const edits: { wall: number; cpu: number }[] = [];
      for (let k = 1; k <= 3; k++) {
        lengthEdit(path, 1e-4 * k);
        edits.push(cli(['check', path]));
      }
      const best = (runs: { wall: number; cpu: number }[]) => runs.reduce((a, b) => (b.wall < a.wall ? b : a));
      const row = {
        nets, cold: cold.wall, coldCpu: cold.cpu, cached: best(cachedRuns).wall, cachedCpu: best(cachedRuns).cpu,
        edit: best(edits).wall, editCpu: best(edits).cpu, bytes, bytesAfter: statSync(path).size,
      };
      rows.push(row);
      console.log(
        `  ${String(nets).padStart(5)} nets: cold ${row.cold.toFixed(2)} s (CPU ${row.coldCpu.toFixed(2)} s, ${((1000 * row.coldCpu) / nets).toFixed(2)} ms CPU per net),` +
          ` cached ${row.cached.toFixed(3)} s (CPU ${row.cachedCpu.toFixed(2)} s), one-net edit ${row.edit.toFixed(3)} s (CPU ${row.editCpu.toFixed(2)} s, best of 3);` +
          ` file ${(row.bytes / 1e6).toFixed(1)} MB after the first check, ${(row.bytesAfter / 1e6).toFixed(1)} MB after 3 edits; CLI: ${bundleState()}`,
      );
      rmSync(path, { force: true });
    }
  } finally {
    rmSync(dir, { recursive: true, force: true });
  }
  if (rows.length >= 2) {
    const n = rows.map((r) => r.nets);
    const net = (t: number) => Math.max(t - startup, 1e-3); // growth of the work beyond the fixed cost
    console.log(
      `  growth exponent over ${n[0]}..${n[n.length - 1]} nets (time beyond the fixed cost ~ nets^b):` +
        ` cold CPU b = ${growthExponent(n, rows.map((r) => r.coldCpu)).toFixed(2)},` +
        ` cold wall b = ${growthExponent(n, rows.map((r) => net(r.cold))).toFixed(2)},` +
        ` cached b = ${growthExponent(n, rows.map((r) => net(r.cached))).toFixed(2)},` +
        ` edit b = ${growthExponent(n, rows.map((r) => net(r.edit))).toFixed(2)}`,
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

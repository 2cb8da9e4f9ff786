/**
 * Running the command line from a benchmark as a user runs it: the prebuilt bundle out/main/cli (as
 * bin/slackline.mjs runs it when fresh) in a child process, timed in wall and CPU time; and the growth
 * exponent the board benchmarks print. Shared by bench/board-scale.bench.ts and bench/report.bench.ts.
 */
import { execFileSync } from 'node:child_process';
import { existsSync, readFileSync, statSync } from 'node:fs';
import { join } from 'node:path';
import { fileURLToPath, pathToFileURL } from 'node:url';

const root = fileURLToPath(new URL('..', import.meta.url));
const bundle = pathToFileURL(join(root, 'out', 'main', 'cli', 'index.js')).href;

/** True when the bundle exists and no source it was built from is newer (bin/slackline.mjs's test). */
export function bundleFresh(): boolean {
  const inputs = join(root, 'out', 'main', 'cli', 'inputs.json');
  if (!existsSync(inputs)) return false;
  const { builtAt, inputs: files } = JSON.parse(readFileSync(inputs, 'utf8')) as { builtAt: number; inputs: string[] };
  return !files.some((f) => !existsSync(join(root, f)) || statSync(join(root, f)).mtimeMs > builtAt);
}

/** Runs the bundle's main() on `args` exactly as bin/slackline.mjs does for a fresh bundle. */
const runner = (args: string[]): string[] => [
  '--input-type=module', '-e',
  `const { main } = await import(${JSON.stringify(bundle)}); process.exitCode = await main(${JSON.stringify(args)});`,
];

/** Wall time of one CLI run, s, and its CPU time (user + system of the child), s. */
export function cli(args: string[]): { wall: number; cpu: number } {
  const t0 = performance.now();
  const cpu0 = childCpu();
  try {
    execFileSync(process.execPath, runner(args), { stdio: 'ignore' });
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

/** Least-squares slope of log(y) against log(x). */
export function growthExponent(x: number[], y: number[]): number {
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

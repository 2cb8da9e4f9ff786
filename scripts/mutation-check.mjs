#!/usr/bin/env node
// Mutation check of the stackup and solver suites: in a scratch copy of the repository, break one
// formula at a time on purpose and record which tests catch it. A mutation no test catches is a hole
// in the suites. The table it prints is the one in DEVELOPERS.md ("Mutation check").
//
// Usage: node scripts/mutation-check.mjs [--scratch /tmp/mutate] [--only id,id] [--json out.json]
//        node scripts/mutation-check.mjs --kj-sweep   (each Kirschning-Jansen coefficient +1 %, one at a time,
//        against tests/core/stackup/coupled-microstrip.test.ts: which of its two checks catches it)
// The scratch copy leaves out node_modules (symlinked to this checkout's) and .git; this checkout is
// never modified. Runs vitest on tests/core/stackup, tests/core/solver and tests/ngspice only.
import { cpSync, existsSync, mkdirSync, readFileSync, rmSync, symlinkSync, writeFileSync } from 'node:fs';
import { spawnSync } from 'node:child_process';
import { dirname, join, relative, resolve } from 'node:path';
import { fileURLToPath } from 'node:url';

const root = resolve(dirname(fileURLToPath(import.meta.url)), '..');
const SUITES = ['tests/core/stackup', 'tests/core/solver', 'tests/ngspice'];

/** Each mutation: one exact text in one file replaced by a plausible slip. */
export const MUTATIONS = [
  // Stackup
  { id: 'hj-epseff', what: 'Hammerstad-Jensen εeff: (1 + 10/u) -> (1 + 12/u)', file: 'core/stackup/hammerstad-jensen.ts',
    from: 'Math.pow(1 + 10 / u, -a * b)', to: 'Math.pow(1 + 12 / u, -a * b)' },
  { id: 'hj-b', what: 'Hammerstad-Jensen b(εr): 0.564 -> 0.584', file: 'core/stackup/hammerstad-jensen.ts',
    from: '0.564 * Math.pow', to: '0.584 * Math.pow' },
  { id: 'hj-z01', what: 'Hammerstad-Jensen Z01 f(u): 30.666 -> 30.0', file: 'core/stackup/hammerstad-jensen.ts',
    from: '30.666 / u', to: '30.0 / u' },
  { id: 'hj-thickness', what: 'Hammerstad-Jensen thickness ΔW: 4e -> 2e', file: 'core/stackup/hammerstad-jensen.ts',
    from: '(4 * E) / (t * coth * coth)', to: '(2 * E) / (t * coth * coth)' },
  { id: 'cohn-ratio', what: "Cohn 1954 stripline: K(k)/K(k') inverted", file: 'core/stackup/cohn-stripline.ts',
    from: 'ellipticKRatio(k, kPrime)', to: 'ellipticKRatio(kPrime, k)' },
  { id: 'cohn-odd', what: 'Cohn 1955 odd-mode modulus: a/c -> a/sqrt(c)', file: 'core/stackup/cohn-stripline.ts',
    from: 'const ko = a / c;', to: 'const ko = a / Math.sqrt(c);' },
  { id: 'elliptic-k', what: "K(k) = π/(2·AGM(1,k')) loses the 2", file: 'core/stackup/elliptic.ts',
    from: 'return Math.PI / (2 * agm(1, kPrime));', to: 'return Math.PI / agm(1, kPrime);' },
  { id: 'wheeler-627', what: 'Wheeler 1978 stripline: 6.27 -> 6.0', file: 'core/stackup/wheeler-stripline.ts',
    from: 'p * p + 6.27', to: 'p * p + 6.0' },
  { id: 'offset-spacing', what: 'offset stripline halves: plane spacing 2h + t -> 2h', file: 'core/stackup/offset-stripline.ts',
    from: 'wheelerStriplineZ0(width, thickness, 2 * h1 + thickness, er)', to: 'wheelerStriplineZ0(width, thickness, 2 * h1, er)' },
  { id: 'kj-q2', what: 'Kirschning-Jansen Q2: 0.7519 -> 0.7595 (+1 %)', file: 'core/stackup/kirschning-jansen.ts',
    from: '1 + 0.7519 * g', to: '1 + 0.7595 * g' },
  { id: 'kj-q3', what: 'Kirschning-Jansen Q3: 16.6 -> 16.77 (+1 %)', file: 'core/stackup/kirschning-jansen.ts',
    from: 'Math.pow(16.6 +', to: 'Math.pow(16.77 +' },
  { id: 'ipc-598', what: 'IPC-2141A microstrip: 5.98h -> 5.9h', file: 'core/stackup/ipc-2141a.ts',
    from: '(87 / Math.sqrt(er + 1.41)) * Math.log((5.98 * height)', to: '(87 / Math.sqrt(er + 1.41)) * Math.log((5.9 * height)' },
  // Solver
  { id: 'bergeron-sign', what: 'Bergeron history e = 2v/Z0 - Ih -> 2v/Z0 + Ih', file: 'core/solver/march.ts',
    from: 'ring[pw] = g2 * x[a] - ring[pw];', to: 'ring[pw] = g2 * x[a] + ring[pw];' },
  { id: 'history-interp', what: 'fractional-delay interpolation weight f -> 1 - f', file: 'core/solver/march.ts',
    from: 'const f = frac[k];', to: 'const f = 1 - frac[k];' },
  { id: 'line-dc-current', what: 'line history at t = 0: DC current sign at end b', file: 'core/solver/transient.ts',
    from: 'const eb = x[T.b[k]] * g - ia;', to: 'const eb = x[T.b[k]] * g + ia;' },
  { id: 'trap-cap', what: 'trapezoidal capacitor history: i = G·v - j -> G·v + j', file: 'core/solver/march.ts',
    from: 'const j = capG2[k] * (x[a] - x[b]) - capJ[k];', to: 'const j = capG2[k] * (x[a] - x[b]) + capJ[k];' },
  { id: 'trap-ind', what: 'trapezoidal inductor history: i = G·v + j -> G·v - j', file: 'core/solver/march.ts',
    from: 'const j = indG2[k] * (x[a] - x[b]) + indJ[k];', to: 'const j = indG2[k] * (x[a] - x[b]) - indJ[k];' },
  { id: 'ramp-start', what: "ramp start v0' = Vpin + (v0 - Vpin)·Rnew/Rold -> ·Rold/Rnew", file: 'core/solver/transient.ts',
    from: 'pinDc + ((v0 - pinDc) * rNew) / rOld', to: 'pinDc + ((v0 - pinDc) * rOld) / rNew' },
  { id: 'full-ramp', what: 'full ramp = t10-90/0.8 -> t10-90', file: 'core/circuit/topology.ts',
    from: 'return tenToNinety / 0.8;', to: 'return tenToNinety;' },
  { id: 'reflection', what: 'reflection coefficient Γ = (Zt - Z0)/(Zt + Z0) -> (Z0 - Zt)/(Zt + Z0)', file: 'core/solver/closed-form.ts',
    from: '(zt - z0) / (zt + z0)', to: '(z0 - zt) / (zt + z0)' },
  { id: 'launch-step', what: 'launched step Vs·Z0/(Z0 + Zs) -> Vs·Zs/(Z0 + Zs)', file: 'core/solver/closed-form.ts',
    from: 'return (vs * z0) / (z0 + zs);', to: 'return (vs * zs) / (z0 + zs);' },
];

function makeScratch(scratch) {
  rmSync(scratch, { recursive: true, force: true });
  mkdirSync(scratch, { recursive: true });
  const skip = new Set(['node_modules', '.git', 'test-output', 'out']);
  cpSync(root, scratch, {
    recursive: true,
    filter: (src) => {
      const rel = relative(root, src);
      return rel === '' || !skip.has(rel.split(/[\\/]/)[0]);
    },
  });
  symlinkSync(join(root, 'node_modules'), join(scratch, 'node_modules'), 'dir');
}

/** Runs the suites in the scratch copy; returns { failed: Set of "file > test", passed: count }. */
function runSuites(scratch) {
  const report = join(scratch, 'mutation-report.json');
  rmSync(report, { force: true });
  // SLACKLINE_MARCH=js: the physics suites run the JavaScript time loop, where the solver mutations
  // are made (the WebAssembly loop is held to it by tests/core/solver/march-kernel.test.ts).
  spawnSync('npx', ['vitest', 'run', ...SUITES, '--reporter=json', `--outputFile=${report}`], {
    cwd: scratch, env: { ...process.env, SLACKLINE_MARCH: 'js' }, encoding: 'utf8', stdio: ['ignore', 'ignore', 'ignore'], timeout: 900_000,
  });
  if (!existsSync(report)) return { failed: new Set(['(vitest produced no report: compile error or crash)']), passed: 0, broken: true };
  const json = JSON.parse(readFileSync(report, 'utf8'));
  const failed = new Set();
  let passed = 0;
  for (const file of json.testResults) {
    const name = relative(scratch, file.name);
    if (file.status === 'failed' && file.assertionResults.length === 0) failed.add(`${name} (file failed to load)`);
    for (const t of file.assertionResults) {
      if (t.status === 'failed') failed.add(`${name} > ${t.fullName}`);
      else if (t.status === 'passed') passed++;
    }
  }
  return { failed, passed, broken: false };
}

/** "tests/core/stackup/lines.test.ts > a > b" -> per file, how many tests failed. */
function summarise(caught) {
  const perFile = new Map();
  for (const key of caught) {
    const file = key.split(' > ')[0].replace(/^tests\//, '');
    perFile.set(file, (perFile.get(file) ?? 0) + 1);
  }
  return [...perFile].map(([file, n]) => `${file} (${n})`).join(', ');
}

const KJ_FILE = 'core/stackup/kirschning-jansen.ts';
/** Values that are structure, not fitted coefficients (factors of 2, powers of ten, unity). */
const KJ_STRUCTURAL = new Set(['0', '1', '2', '10']);

/** Every fitted coefficient of the K&J function: its offset in the file and its text. */
function kjCoefficients(text) {
  const start = text.indexOf('const u = width');
  const end = text.indexOf('\n}\n', start);
  const found = [];
  let offset = start;
  for (const line of text.slice(start, end).split('\n')) {
    const code = line.split('//')[0];
    for (const m of code.matchAll(/(?<![\w.])\d+(?:\.\d+)?(?![\w.])/g)) {
      if (!KJ_STRUCTURAL.has(m[0])) found.push({ at: offset + m.index, literal: m[0], line: line.trim() });
    }
    offset += line.length + 1;
  }
  return found;
}

function kjSweep(scratch) {
  const path = join(scratch, KJ_FILE);
  const original = readFileSync(path, 'utf8');
  const suite = 'tests/core/stackup/coupled-microstrip.test.ts';
  const report = join(scratch, 'kj-report.json');
  const rows = [];
  for (const c of kjCoefficients(original)) {
    const bumped = String(Number((Number(c.literal) * 1.01).toPrecision(6)));
    writeFileSync(path, original.slice(0, c.at) + bumped + original.slice(c.at + c.literal.length));
    rmSync(report, { force: true });
    spawnSync('npx', ['vitest', 'run', suite, '--reporter=json', `--outputFile=${report}`], { cwd: scratch, stdio: 'ignore', timeout: 300_000 });
    const json = existsSync(report) ? JSON.parse(readFileSync(report, 'utf8')) : { testResults: [] };
    const failed = json.testResults.flatMap((f) => f.assertionResults.filter((t) => t.status === 'failed').map((t) => t.fullName));
    const mom = failed.some((n) => n.includes('against the quasi-static MoM'));
    const reimpl = failed.some((n) => n.includes('independent re-implementation'));
    rows.push({ ...c, bumped, mom, reimpl });
    console.error(`${c.literal} -> ${bumped}: MoM ${mom ? 'caught' : 'missed'}, re-implementation ${reimpl ? 'caught' : 'missed'}`);
  }
  writeFileSync(path, original);
  console.log('| coefficient (+1 %) | in | MoM comparison | independent re-implementation |');
  console.log('| --- | --- | --- | --- |');
  for (const r of rows) {
    console.log(`| ${r.literal} -> ${r.bumped} | \`${r.line.slice(0, 60).replace(/\|/g, '\\|')}\` | ${r.mom ? 'caught' : '**missed**'} | ${r.reimpl ? 'caught' : '**missed**'} |`);
  }
  const mom = rows.filter((r) => r.mom).length;
  const reimpl = rows.filter((r) => r.reimpl).length;
  console.log(`\n${rows.length} coefficients: the MoM comparison catches ${mom}, the independent re-implementation ${reimpl}.`);
}

function main() {
  const args = process.argv.slice(2);
  const opt = (name) => (args.includes(name) ? args[args.indexOf(name) + 1] : undefined);
  const scratch = resolve(opt('--scratch') ?? '/tmp/mutate');
  const only = opt('--only')?.split(',');
  const jsonOut = opt('--json');
  if (scratch === root || !relative(root, scratch).startsWith('..')) throw new Error('the scratch copy must lie outside the repository');
  makeScratch(scratch);
  if (args.includes('--kj-sweep')) {
    kjSweep(scratch);
    rmSync(scratch, { recursive: true, force: true });
    return;
  }
  console.error(`scratch copy: ${scratch}; baseline run...`);
  const baseline = runSuites(scratch);
  console.error(`baseline: ${baseline.passed} passed, ${baseline.failed.size} failed${baseline.failed.size ? ': ' + [...baseline.failed].join('; ') : ''}`);
  const rows = [];
  for (const m of MUTATIONS.filter((x) => !only || only.includes(x.id))) {
    const path = join(scratch, m.file);
    const original = readFileSync(path, 'utf8');
    const count = original.split(m.from).length - 1;
    if (count !== 1) {
      rows.push({ ...m, applied: false, caught: [], note: `pattern found ${count} times` });
      console.error(`${m.id}: not applied (pattern found ${count} times)`);
      continue;
    }
    writeFileSync(path, original.replace(m.from, m.to));
    const result = runSuites(scratch);
    writeFileSync(path, original);
    const caught = [...result.failed].filter((k) => !baseline.failed.has(k));
    rows.push({ ...m, applied: true, caught, note: result.broken ? 'no report' : '' });
    console.error(`${m.id}: caught by ${caught.length} test(s)`);
  }
  if (jsonOut) writeFileSync(jsonOut, JSON.stringify({ baseline: { passed: baseline.passed, failed: [...baseline.failed] }, rows }, null, 2));
  console.log('| mutation | file | tests failing | caught by (file, failing tests) |');
  console.log('| --- | --- | --- | --- |');
  for (const r of rows) {
    const by = !r.applied ? `not applied: ${r.note}` : r.caught.length ? summarise(r.caught) : '**not caught**';
    console.log(`| ${r.what} | \`${r.file}\` | ${r.applied ? r.caught.length : '-'} | ${by} |`);
  }
  rmSync(scratch, { recursive: true, force: true });
}

if (process.argv[1] && resolve(process.argv[1]) === fileURLToPath(import.meta.url)) main();

#!/usr/bin/env node
// Builds the prebuilt command-line bundle (optional): the CLI and its commands into out/main/cli (ES
// modules with shared chunks, so `import('./commands/NAME.js')` finds each command beside the entry)
// and each worker thread (solver, cross-sections, report charts) as one self-contained .mjs beside the chunk that
// holds the module starting it (which starts ./NAME.mjs beside itself). The bundle sits three folders
// below the root, like its sources, so paths the services resolve from import.meta.url (migrations/,
// package.json) point at the same places. Every npm package stays external (resolved from node_modules at run time;
// better-sqlite3 is native).
//
// bin/slackline.mjs runs the bundle only while it is fresh: inputs.json lists every source file the
// build read, and when one of them is newer than the build (or the bundle is missing) it runs the
// TypeScript sources through tsx instead. Tests always run from source.
import { build } from 'esbuild';
import { readFileSync, readdirSync, rmSync, writeFileSync } from 'node:fs';
import { fileURLToPath } from 'node:url';
import { dirname, join, relative } from 'node:path';

const root = fileURLToPath(new URL('..', import.meta.url));
export const CLI_OUT = join(root, 'out', 'main', 'cli');

/** The worker threads the CLI starts: each entry, the module that starts it, and the file it looks for. */
const WORKERS = [
  { entry: 'main/services/solve/solve-worker.ts', starter: 'main/services/solve/worker-pool.ts', out: 'solve-worker.mjs' },
  { entry: 'main/services/solve/lines-worker.ts', starter: 'main/services/solve/lines-ahead.ts', out: 'lines-worker.mjs' },
  { entry: 'main/services/report/chart-worker.ts', starter: 'main/services/report/chart-drawings.ts', out: 'chart-worker.mjs' },
];

/**
 * esbuild turns a template-literal import() into a lookup of the files it matched at build time, and
 * the CLI's `import(\`./commands/${name}.js\`)` matches none (the sources are .ts). Hidden behind an
 * array index it stays a run-time import, which finds the command built beside the entry.
 */
const runtimeCommandImport = {
  name: 'runtime-command-import',
  setup(b) {
    b.onLoad({ filter: /[\\/]main[\\/]cli[\\/]index\.ts$/ }, (args) => {
      const source = readFileSync(args.path, 'utf8');
      return { contents: source.replace(/import\((\s*\/\*[^*]*\*\/)?\s*(`\.\/commands\/\$\{name\}\.js`)\s*\)/g, 'import([$2][0])'), loader: 'ts' };
    });
  },
};

/** Builds into `out` (default CLI_OUT, where bin/slackline.mjs looks; a test builds elsewhere). */
export async function buildCli(out = CLI_OUT) {
  rmSync(out, { recursive: true, force: true });
  const common = {
    bundle: true, platform: 'node', format: 'esm', target: 'node20', packages: 'external',
    sourcemap: true, logLevel: 'warning', absWorkingDir: root, metafile: true,
  };
  const commands = readdirSync(join(root, 'main', 'cli', 'commands'))
    .filter((name) => name.endsWith('.ts'))
    .map((name) => join(root, 'main', 'cli', 'commands', name));
  const started = Date.now();
  const cli = await build({
    ...common,
    entryPoints: [join(root, 'main', 'cli', 'index.ts'), ...commands],
    outdir: out,
    outbase: join(root, 'main', 'cli'),
    splitting: true,
    chunkNames: 'chunks/[name]-[hash]',
    plugins: [runtimeCommandImport],
  });
  // Each worker thread's entry is started as `./NAME.mjs` beside the module that starts it, and code
  // splitting puts that module in a shared chunk (out/main/cli/chunks/...), not beside the entry: each
  // worker goes to the folder of whichever output holds its starter. A worker missing there would fail
  // to start, and its work would run on the calling thread (one core only).
  const workers = [];
  for (const w of WORKERS) {
    const holder = Object.entries(cli.metafile.outputs).find(([out, o]) => out.endsWith('.js') && Object.keys(o.inputs).includes(w.starter));
    if (!holder) throw new Error(`build:cli: no output holds ${w.starter}; the place of ${w.out} is unknown`);
    const outfile = join(dirname(join(root, holder[0])), w.out);
    workers.push({ outfile, result: await build({ ...common, entryPoints: [join(root, w.entry)], outfile }) });
  }
  const inputs = [...new Set([cli, ...workers.map((w) => w.result)].flatMap((r) => Object.keys(r.metafile.inputs)))]
    .filter((file) => !file.startsWith('node_modules/'))
    .map((file) => relative(root, join(root, file)))
    .sort();
  writeFileSync(join(out, 'inputs.json'), `${JSON.stringify({ builtAt: started, inputs }, null, 1)}\n`);
  return { entry: join(out, 'index.js'), workers: workers.map((w) => w.outfile), inputs: inputs.length };
}

if (process.argv[1] && fileURLToPath(import.meta.url) === process.argv[1]) {
  const out = await buildCli();
  console.log(`Built the command-line bundle ${relative(root, out.entry)} and its ${out.workers.length} worker entries (${out.inputs} source files).`);
}

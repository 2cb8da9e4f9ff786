#!/usr/bin/env node
// Builds the desktop app: the renderer (vite, into out/renderer) and the Electron main process and
// preload (esbuild, into out/main/electron). The main bundle sits three folders below the root, like
// its sources under main/services/*, so paths the services resolve from import.meta.url (migrations/,
// native/) point at the same places in source and in the bundle.
import { build as viteBuild } from 'vite';
import { build as esbuild } from 'esbuild';
import { fileURLToPath } from 'node:url';
import { join } from 'node:path';

const root = fileURLToPath(new URL('..', import.meta.url));
export const DESKTOP_OUT = join(root, 'out', 'main', 'electron');

export async function buildRenderer() {
  await viteBuild({ configFile: join(root, 'renderer', 'vite.config.ts'), logLevel: 'warn' });
}

export async function buildDesktop() {
  await buildRenderer();
  const common = { bundle: true, platform: 'node', sourcemap: true, logLevel: 'warning', absWorkingDir: root };
  // Electron 39 runs Node 22 in the main process; every npm package stays external (node_modules ships
  // with the app, and better-sqlite3 is native).
  await esbuild({
    ...common,
    entryPoints: [join(root, 'main', 'electron', 'main.ts')],
    outfile: join(DESKTOP_OUT, 'main.js'),
    format: 'esm',
    target: 'node22',
    packages: 'external',
  });
  // The worker threads (solver, cross-sections, import preview, report charts): each started as ./NAME.mjs beside the
  // bundle that runs it.
  for (const entry of ['solve/solve-worker', 'solve/lines-worker', 'project/import-preview-worker', 'report/chart-worker']) {
    await esbuild({
      ...common,
      entryPoints: [join(root, 'main', 'services', `${entry}.ts`)],
      outfile: join(DESKTOP_OUT, `${entry.split('/')[1]}.mjs`),
      format: 'esm',
      target: 'node22',
      packages: 'external',
    });
  }
  // A sandboxed preload may require('electron') and nothing else: one self-contained CommonJS file.
  await esbuild({
    ...common,
    entryPoints: [join(root, 'main', 'electron', 'preload.ts')],
    outfile: join(DESKTOP_OUT, 'preload.cjs'),
    format: 'cjs',
    target: 'chrome130',
    external: ['electron'],
  });
  return { main: join(DESKTOP_OUT, 'main.js'), preload: join(DESKTOP_OUT, 'preload.cjs') };
}

if (process.argv[1] && fileURLToPath(import.meta.url) === process.argv[1]) {
  const out = await buildDesktop();
  console.log(`Built the renderer (out/renderer) and the desktop main process (${out.main}).`);
}

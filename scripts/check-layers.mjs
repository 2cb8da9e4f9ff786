#!/usr/bin/env node
// Enforces the layering of DESIGN.md §7: arrows point down only.
//   core/      imports nothing from main/ or renderer/, and no Node, Electron or DOM-host module.
//   renderer/  imports nothing from main/ and no Node or Electron module (only core/ types and its own).
//   main/      imports nothing from renderer/ (it may serve renderer's built files, never import them).
import { readdirSync, readFileSync, statSync } from 'node:fs';
import { join, relative, resolve, dirname } from 'node:path';

const root = resolve(dirname(new URL(import.meta.url).pathname), '..');
const NODE_BUILTINS = new Set([
  'fs', 'path', 'os', 'child_process', 'worker_threads', 'crypto', 'http', 'https', 'net', 'url',
  'util', 'stream', 'events', 'buffer', 'process', 'zlib', 'readline', 'module', 'vm', 'tty', 'assert',
]);
const IMPORT_RE = /(?:^|[\s;])(?:import|export)\s[^'"]*?from\s*['"]([^'"]+)['"]|import\(\s*['"]([^'"]+)['"]\s*\)|^\s*import\s*['"]([^'"]+)['"]/gm;

function* walk(dir) {
  for (const name of readdirSync(dir)) {
    if (name === 'node_modules' || name.startsWith('.')) continue;
    const path = join(dir, name);
    if (statSync(path).isDirectory()) yield* walk(path);
    else if (/\.(ts|mts|vue|js|mjs)$/.test(name)) yield path;
  }
}

const rules = {
  core: (spec, targetTop) =>
    (spec.startsWith('node:') || NODE_BUILTINS.has(spec.split('/')[0]) ? 'a Node module' : null) ??
    (spec === 'electron' || spec.startsWith('electron/') ? 'Electron' : null) ??
    (spec === 'better-sqlite3' ? 'a database driver' : null) ??
    (targetTop === 'main' || targetTop === 'renderer' ? `${targetTop}/` : null),
  renderer: (spec, targetTop) =>
    (spec.startsWith('node:') || NODE_BUILTINS.has(spec.split('/')[0]) ? 'a Node module' : null) ??
    (spec === 'electron' || spec.startsWith('electron/') ? 'Electron' : null) ??
    (spec === 'better-sqlite3' ? 'a database driver' : null) ??
    (targetTop === 'main' ? 'main/' : null),
  main: (_spec, targetTop) => (targetTop === 'renderer' ? 'renderer/ (serve its build output instead)' : null),
};

const problems = [];
for (const layer of Object.keys(rules)) {
  const dir = join(root, layer);
  let files;
  try { files = [...walk(dir)]; } catch { continue; }
  for (const file of files) {
    if (layer === 'renderer' && /vite\.config\.ts$/.test(file)) continue; // build config runs in Node
    const text = readFileSync(file, 'utf8');
    for (const m of text.matchAll(IMPORT_RE)) {
      const spec = m[1] ?? m[2] ?? m[3];
      let targetTop = null;
      if (spec.startsWith('.')) targetTop = relative(root, resolve(dirname(file), spec)).split(/[\\/]/)[0];
      const broken = rules[layer](spec, targetTop);
      if (broken) {
        const line = text.slice(0, m.index).split('\n').length;
        problems.push(`${relative(root, file)}:${line}: ${layer}/ must not import ${broken} ("${spec}")`);
      }
    }
  }
}
if (problems.length) {
  console.error(`Layering check failed (DESIGN.md §7):\n${problems.join('\n')}`);
  process.exit(1);
}
console.log('Layering check: core/, renderer/ and main/ import only downward.');

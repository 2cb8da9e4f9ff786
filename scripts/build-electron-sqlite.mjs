#!/usr/bin/env node
// Builds better-sqlite3's native addon for Electron's ABI into native/electron/better_sqlite3.node,
// leaving node_modules/better-sqlite3/build (the Node build the tests and the CLI load) untouched.
// The desktop app passes this file as better-sqlite3's `nativeBinding` when it runs inside Electron
// (main/services/db/native-binding.ts). Needs network once: node-gyp downloads Electron's headers.
//
//   npm run build:electron-sqlite
import { createRequire } from 'node:module';
import { cpSync, mkdirSync, mkdtempSync, copyFileSync, rmSync, existsSync } from 'node:fs';
import { spawnSync } from 'node:child_process';
import { tmpdir } from 'node:os';
import { dirname, join } from 'node:path';
import { fileURLToPath } from 'node:url';

const root = fileURLToPath(new URL('..', import.meta.url));
const require = createRequire(import.meta.url);
const electronVersion = require('electron/package.json').version;
const source = dirname(require.resolve('better-sqlite3/package.json'));
const target = join(root, 'native', 'electron', 'better_sqlite3.node');

// npm exports the path of its own node-gyp to scripts it runs; otherwise fall back to npx.
const gyp = process.env.npm_config_node_gyp
  ? [process.execPath, process.env.npm_config_node_gyp]
  : ['npx', 'node-gyp'];

const work = mkdtempSync(join(tmpdir(), 'slackline-sqlite-electron-'));
try {
  cpSync(source, work, { recursive: true, filter: (path) => !path.includes(`${source}/build`) && !path.includes('node_modules') });
  const args = [
    'rebuild', '--release',
    `--target=${electronVersion}`, '--runtime=electron', '--dist-url=https://electronjs.org/headers',
    `--arch=${process.arch}`,
  ];
  console.log(`Building better-sqlite3 for Electron ${electronVersion} (${process.platform}-${process.arch}) in ${work} …`);
  const result = spawnSync(gyp[0], [...gyp.slice(1), ...args], { cwd: work, stdio: 'inherit' });
  if (result.status !== 0) {
    console.error('node-gyp failed: it needs network access (Electron headers), Python 3 and a C++ compiler.');
    process.exit(result.status ?? 1);
  }
  const built = join(work, 'build', 'Release', 'better_sqlite3.node');
  if (!existsSync(built)) throw new Error(`node-gyp finished but ${built} is missing`);
  mkdirSync(dirname(target), { recursive: true });
  copyFileSync(built, target);
  console.log(`Wrote ${target}. The Node build in node_modules was not touched.`);
} finally {
  rmSync(work, { recursive: true, force: true });
}

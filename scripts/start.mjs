#!/usr/bin/env node
// `npm start`: builds and launches the desktop app on the demo project where the Electron binary is
// installed. Where it is not (build machines install the electron package without its binary), says
// so in one line and serves the same workbench through the loopback HTTP shell instead.
import { createRequire } from 'node:module';
import { existsSync } from 'node:fs';
import { spawn } from 'node:child_process';
import { fileURLToPath } from 'node:url';
import { join } from 'node:path';
import { buildDesktop, buildRenderer } from './build-desktop.mjs';

const root = fileURLToPath(new URL('..', import.meta.url));
const require = createRequire(import.meta.url);

function electronBinary() {
  try {
    const path = require('electron'); // the package exports the binary's path, or throws without it
    return typeof path === 'string' && existsSync(path) ? path : null;
  } catch {
    return null;
  }
}

function run(command, args) {
  const child = spawn(command, args, { cwd: root, stdio: 'inherit', env: process.env });
  const forward = (signal) => child.kill(signal);
  process.on('SIGINT', forward);
  process.on('SIGTERM', forward);
  child.on('exit', (code, signal) => process.exit(code ?? (signal ? 1 : 0)));
}

const binary = electronBinary();
const userArgs = process.argv.slice(2);
if (binary) {
  const { main } = await buildDesktop();
  run(binary, [main, ...userArgs]);
} else {
  console.log('Electron is not available here (its binary is not installed), so the workbench is served through the loopback shell instead:');
  await buildRenderer();
  run(process.execPath, [join(root, 'node_modules', 'tsx', 'dist', 'cli.mjs'), join(root, 'main', 'web', 'start.ts'), ...userArgs]);
}

/**
 * Which better-sqlite3 native addon to load. A native addon is built for one ABI: the tests and the
 * CLI run on Node's, the desktop app on Electron's. Both live in one checkout: the Node build stays
 * where npm put it (node_modules/better-sqlite3/build/Release), the Electron build goes to
 * native/electron/better_sqlite3.node (scripts/build-electron-sqlite.mjs), and the database opener
 * passes this path as better-sqlite3's `nativeBinding` option when running inside Electron.
 */
import { existsSync } from 'node:fs';
import { dirname, join, resolve } from 'node:path';
import { fileURLToPath } from 'node:url';

/** Repository (or packaged app) root: this file sits three folders below it, in source and in out/. */
function appRoot(): string {
  return resolve(dirname(fileURLToPath(import.meta.url)), '..', '..', '..');
}

export const ELECTRON_SQLITE_BINDING = join('native', 'electron', 'better_sqlite3.node');

/**
 * The Electron-ABI addon path when running inside Electron (and it exists), else undefined so
 * better-sqlite3 loads its own Node build. `root` and `versions` are parameters for the tests.
 */
export function sqliteNativeBinding(
  versions: NodeJS.ProcessVersions = process.versions,
  root: string = process.env.SLACKLINE_APP_ROOT ?? appRoot(),
): string | undefined {
  if (!versions.electron) return undefined;
  const candidates = [
    join(root, ELECTRON_SQLITE_BINDING),
    // electron-builder unpacks native files next to app.asar (asarUnpack).
    join(root.replace(/app\.asar$/, 'app.asar.unpacked'), ELECTRON_SQLITE_BINDING),
  ];
  return candidates.find((path) => existsSync(path));
}

/**
 * Child process for killed-import.test.ts: applies a length report to a project. With "pause" it
 * stops inside the import transaction once 3/4 of the changed segments are written, says so on
 * stdout, and waits to be killed.
 * Usage: node --import tsx/esm tests/main/import/import-child.ts PROJECT CSV [pause]
 */
import { readFileSync, writeSync } from 'node:fs';
import { ProjectStore } from '../../../main/services/project/project-store.js';

const [projectPath, csvPath, mode] = process.argv.slice(2);
// A 1 MB page cache (the driver's default is 16 MB) so that a large transaction spills its
// uncommitted pages to the WAL before the pause, as it would on a project too big for the cache.
const store = ProjectStore.open(projectPath, { author: 'child', cacheSizeKib: 1024 });
const csv = readFileSync(csvPath, 'utf8');
let paused = false;
const result = store.applyImport('large.csv', csv, {
  onProgress(done, total) {
    if (mode !== 'pause' || paused || done < total * 0.75) return;
    paused = true;
    writeSync(1, `paused ${done}/${total}\n`);
    // Blocks this thread inside the open transaction; the parent sends SIGKILL meanwhile.
    Atomics.wait(new Int32Array(new SharedArrayBuffer(4)), 0, 0, 120_000);
  },
});
store.close();
writeSync(1, `finished applied=${String(result.applied)} changed=${result.counts.changed}\n`);

/**
 * Project files under stress (docs/reliability.md): a held write lock, damaged files and the doctor,
 * imports as strict as the solver, the command line's exit statuses.
 */
import { existsSync, readFileSync, rmSync, truncateSync, writeFileSync } from 'node:fs';
import { afterEach, beforeEach, describe, expect, it } from 'vitest';
import Database from 'better-sqlite3';
import { ProjectStore } from '../../../main/services/project/project-store.js';
import { DamagedProjectError, ProjectBusyError } from '../../../main/services/db/project-errors.js';
import { main } from '../../../main/cli/index.js';
import { openWorkbench } from '../../../main/services/compose.js';
import { parseArguments } from '../../../main/services/api/schemas.js';
import { syntheticProject } from '../../../fixtures/lengths/synthetic.js';
import { fileHash, makeTempDir } from './temp-files.js';

function capture(): { io: { out: (t: string) => void; err: (t: string) => void }; out: string[]; err: string[] } {
  const out: string[] = [];
  const err: string[] = [];
  return { io: { out: (t) => out.push(t), err: (t) => err.push(t) }, out, err };
}

describe('reliability of project files', () => {
  let temp: ReturnType<typeof makeTempDir>;
  let path: string;
  beforeEach(() => {
    temp = makeTempDir('slackline-rel-');
    path = temp.file('p.slackline');
    ProjectStore.create(path, syntheticProject(3, 2), { author: 'setup' }).close();
  });
  afterEach(() => temp.remove());

  it('a write lock held by another connection ends in "in use by another process" after the bounded wait, nothing written', () => {
    const store = ProjectStore.open(path, { busyTimeoutMs: 200 });
    const other = new Database(path);
    other.prepare('BEGIN IMMEDIATE').run(); // another process in the middle of a write
    try {
      // Opening for writing also waits, then says so (it refreshes the stored presets in a transaction).
      expect(() => ProjectStore.open(path, { busyTimeoutMs: 100 })).toThrow(ProjectBusyError);
      // The import reads, then writes: with a deferred BEGIN the driver's error escaped as SqliteError.
      expect(() => store.applyImport('r.csv', 'net,layer,length_mm\nNET0,L1_TOP,42\n')).toThrow(ProjectBusyError);
      expect(() => store.updateInfo({ description: 'x' })).toThrow(/in use by another process/);
    } finally {
      other.prepare('ROLLBACK').run();
      other.close();
    }
    expect(store.changeLog(10).map((e) => e.action)).toEqual(['create-project']);
    store.close();
  });

  it('refuses lengths the solver refuses: 0 mm and 1e-400 mm (underflows to 0)', () => {
    const store = ProjectStore.open(path);
    try {
      const preview = store.applyImport('r.csv', 'net,layer,length\nNET0,L1_TOP,0mm\nNET1,L1_TOP,1e-400mm\n');
      expect(preview.applied).toBe(false);
      expect(preview.errors).toEqual([
        expect.stringMatching(/^r\.csv line 2 column 3 \(length\): .*greater than 0 mm/),
        expect.stringMatching(/^r\.csv line 3 column 3 \(length\): .*greater than 0 mm/),
      ]);
    } finally {
      store.close();
    }
  });

  it('refuses a repeated (net, layer, length) row unless confirmed; confirmed, the rule is in the preview', () => {
    const store = ProjectStore.open(path);
    try {
      const csv = 'net,layer,length_mm\nNET0,L1_TOP,7\nNET0,L1_TOP,7\n';
      const refused = store.applyImport('r.csv', csv);
      expect(refused.applied).toBe(false);
      expect(refused.errors).toEqual([expect.stringMatching(/^r\.csv line 3: repeats line 2 \(net NET0, layer L1_TOP, 7\.000 mm\)/)]);
      // NET0 has one segment on L1_TOP (synthetic: layers cycle L1_TOP, L3_SIG): the repeat is "new", not written.
      const confirmed = store.applyImport('r.csv', csv, { allowRepeatedRows: true });
      expect(confirmed.errors).toEqual([]);
      expect(confirmed.notes).toEqual([expect.stringContaining('Repeated rows')]);
    } finally {
      store.close();
    }
  });

  it('the service API takes the same confirmation: refused without it, applied with the rule stated', async () => {
    const bench = await openWorkbench(path, { solve: { workers: 0 } });
    try {
      const csv = 'net,layer,length_mm\nNET0,L1_TOP,7\nNET0,L1_TOP,7\n';
      const refused = await bench.api.applyImport('r.csv', csv);
      expect(refused.errors).toEqual([expect.stringMatching(/^r\.csv line 3: repeats line 2/)]);
      // the arguments pass the same schema every host checks payloads with
      expect(() => parseArguments('applyImport', ['r.csv', csv, { allowRepeatedRows: true }])).not.toThrow();
      expect(() => parseArguments('applyImport', ['r.csv', csv, { allowRepeats: 1 }])).toThrow(/invalid arguments/);
      const preview = await bench.api.previewImport('r.csv', csv, { allowRepeatedRows: true });
      expect(preview.notes).toEqual([expect.stringContaining('Repeated rows')]);
      const confirmed = await bench.api.applyImport('r.csv', csv, { allowRepeatedRows: true });
      expect(confirmed.errors).toEqual([]);
    } finally {
      await bench.close();
    }
  });

  it('an import that changes nothing writes nothing: no change-log entry, file bytes unchanged', () => {
    const data = syntheticProject(3, 2);
    const first = data.nets[0].elements[0];
    const csv = `net,layer,length_mm\nNET0,L1_TOP,${first.kind === 'segment' ? first.length * 1e3 : 0}\n`;
    ProjectStore.open(path).close(); // settle the WAL into the file (close checkpoints, sqlite.org/wal.html)
    const hash = fileHash(path);
    const store = ProjectStore.open(path);
    const preview = store.applyImport('r.csv', csv);
    expect(preview.counts.matched).toBe(1);
    expect(preview.applied).toBe(false);
    expect(store.changeLog(10).map((e) => e.action)).toEqual(['create-project']);
    store.close();
    expect(fileHash(path)).toBe(hash);
    expect(existsSync(`${path}.last-good`)).toBe(false); // no edit session, no backup copy
  });

  it('a damaged file is refused naming the backup copy; doctor finds the damage and restores the copy', async () => {
    const store = ProjectStore.open(path);
    store.updateInfo({ description: 'edited' }); // first edit of the session: FILE.last-good is written before it
    store.close();
    expect(existsSync(`${path}.last-good`)).toBe(true);
    truncateSync(path, 4096 + 100); // page 1 whole, page 2 cut
    const hash = fileHash(path);
    let refusal: unknown;
    try {
      ProjectStore.open(path);
    } catch (error) {
      refusal = error;
    }
    expect(refusal).toBeInstanceOf(DamagedProjectError);
    expect((refusal as Error).message).toContain(`${path}.last-good`);
    expect(fileHash(path)).toBe(hash);

    const check = capture();
    expect(await main(['show', path], check.io)).toBe(2); // refused in one line, exit 2
    expect(check.err).toHaveLength(1);
    expect(check.err[0]).not.toContain('    at ');
    const doctor = capture();
    expect(await main(['doctor', path], doctor.io)).toBe(1);
    expect(doctor.out.join('\n')).toMatch(/damaged: .*--restore/);
    const restore = capture();
    expect(await main(['doctor', path, '--restore'], restore.io)).toBe(0);
    const restored = ProjectStore.open(path);
    try {
      expect(restored.integrityCheck()).toBe('ok');
      expect(restored.load().info.description).toBe(syntheticProject(3, 2).info.description); // the state before the session
    } finally {
      restored.close();
    }
  });

  it('deeply nested JSON input is bad input (exit 2, located), not a stack overflow', async () => {
    const bad = temp.file('deep.json');
    writeFileSync(bad, '['.repeat(100_000)); // overflowed the recursive error locator before
    const run = capture();
    expect(await main(['sim', bad], run.io)).toBe(2);
    expect(run.err).toEqual([expect.stringMatching(/deep\.json line 1 column 201: nested more than 200 levels deep/)]);
  });

  it('an internal failure exits 70 with one line naming the details file, never a stack trace', async () => {
    // A project the schema allows but the loader does not expect (a net without its driver row):
    // no code path turns that into an input message, so it is a fault of the program.
    const db = new Database(path);
    db.prepare("DELETE FROM net_endpoint WHERE is_driver = 1 AND net_id = (SELECT id FROM net WHERE name = 'NET0')").run();
    db.close();
    const run = capture();
    expect(await main(['show', path], run.io)).toBe(70); // EX_SOFTWARE, docs/reliability.md §4
    expect(run.err).toHaveLength(1);
    const details = /details are in (\S+)$/.exec(run.err[0])?.[1];
    expect(run.err[0]).toMatch(/^slackline show: internal error: net NET0 has no driver row/);
    expect(details && readFileSync(details, 'utf8')).toContain('    at '); // the stack is in the file, not on the terminal
    if (details) rmSync(details, { force: true }); // every file a test makes is removed
  });
});

describe('checking a read-only project from the command line', () => {
  it('runs the check, stores nothing, and says so once (skipped where no tmpfs can be mounted)', async () => {
    const { execFileSync } = await import('node:child_process');
    const { mkdirSync } = await import('node:fs');
    const temp = makeTempDir('slackline-rocli-');
    const dir = `${temp.dir}/ro`;
    mkdirSync(dir);
    try {
      execFileSync('mount', ['-t', 'tmpfs', '-o', 'size=4m', 'tmpfs', dir], { stdio: 'ignore' });
    } catch {
      temp.remove();
      console.log('read-only check: skipped, this machine cannot mount a tmpfs');
      return;
    }
    try {
      const path = `${dir}/p.slackline`;
      ProjectStore.create(path, syntheticProject(2, 2)).close();
      execFileSync('mount', ['-o', 'remount,ro', dir], { stdio: 'ignore' });
      const hash = fileHash(path);
      const run = capture();
      // Before: "attempt to write a readonly database" from the cache write, as a stack trace.
      expect(await main(['check', path], run.io)).toBeLessThanOrEqual(1); // 0 pass or 1 a net fails: the check ran
      expect(run.out.join('\n')).toMatch(/pass, .* tight, .* fail/);
      expect(run.err.filter((l) => l.includes('read-only'))).toHaveLength(1);
      expect(fileHash(path)).toBe(hash);
      const csv = `${temp.dir}/r.csv`;
      writeFileSync(csv, 'net,layer,length_mm\nNET0,L1_TOP,33\n');
      const edit = capture();
      expect(await main(['import', path, csv], edit.io)).toBe(2); // refused clearly, exit 2
      expect(edit.err).toEqual([expect.stringMatching(/the project is read-only .*refused and nothing was written/)]);
      expect(fileHash(path)).toBe(hash);
    } finally {
      execFileSync('umount', [dir], { stdio: 'ignore' });
      temp.remove();
    }
  });
});

describe('a length report past the size limit', () => {
  it('is refused before it is read or parsed, naming the file and the limit', async () => {
    const temp = makeTempDir('slackline-big-');
    try {
      const path = temp.file('p.slackline');
      ProjectStore.create(path, syntheticProject(2, 2)).close();
      const csv = temp.file('big.csv');
      // 50 MB: the size of report that took 1.2 GB of memory; a sparse file, so the test writes nothing much.
      writeFileSync(csv, 'net,layer,length_mm\n');
      (await import('node:fs')).truncateSync(csv, 50 * 1024 * 1024);
      const run = capture();
      expect(await main(['import', path, csv, '--dry-run'], run.io)).toBe(2);
      expect(run.err).toEqual([expect.stringMatching(/big\.csv: is 50\.0 MB; length reports up to 16 MB are read/)]);
      const store = ProjectStore.open(path);
      try {
        // The service checks the same limit for text handed over by the other hosts.
        expect(() => store.previewImport('r.csv', 'x'.repeat(16 * 1024 * 1024 + 1))).toThrow(/length reports up to 16 MB/);
      } finally {
        store.close();
      }
    } finally {
      temp.remove();
    }
  });
});

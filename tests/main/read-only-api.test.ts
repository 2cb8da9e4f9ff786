/**
 * A project opened read-only through the service API every host serves (docs/workbench.md,
 * "Read-only projects"): getProject says why, every edit is refused naming that reason before
 * anything is solved or written, the file stays byte for byte as it was, and reading and solving
 * still work. The machine may run as root, so the read-only state comes from the store's readOnly
 * option (the shells' --read-only), not from file permissions.
 */
import { afterAll, describe, expect, it } from 'vitest';
import { createHash } from 'node:crypto';
import { mkdtempSync, readFileSync, rmSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { createDemo, folderPlacement, openWorkbench, openWorkbenchSession } from '../../main/services/compose.js';
import { dispatchApiCall } from '../../main/services/api/dispatch.js';
import type { SlacklineApi } from '../../core/contract/api.js';

const dir = mkdtempSync(join(tmpdir(), 'slackline-read-only-'));
afterAll(() => rmSync(dir, { recursive: true, force: true }));

const hashOf = (path: string) => createHash('sha256').update(readFileSync(path)).digest('hex');
const REASON = 'opened read-only on request'; // the store's words for its readOnly option (main/services/db/open-database.ts)

describe('a read-only project through SlacklineApi', () => {
  it('says why in getProject and refuses every edit, naming the reason, with the file unchanged', async () => {
    const path = createDemo(join(dir, 'a'));
    const before = hashOf(path);
    const bench = await openWorkbench(path, { store: { readOnly: true } });
    try {
      const { api } = bench;
      const summary = await api.getProject();
      expect(summary.readOnly).toBe(REASON); // docs/workbench.md, "Read-only projects"
      expect(bench.readOnly).toBe(REASON);
      const { data } = summary;
      const net = data.nets[0];
      const segment = net.elements.findIndex((e) => e.kind === 'segment');
      const part = data.parts[0];
      const bus = data.buses[0];
      // One call per edit the API offers; each must be refused before it is stored (common practice, no source).
      const edits: [string, () => Promise<unknown>][] = [
        ['updateInfo', () => api.updateInfo({ name: 'renamed' })],
        ['updateStackup', () => api.updateStackup(data.stackup)],
        ['upsertPart', () => api.upsertPart(part)],
        ['updateBus', () => api.updateBus(bus)],
        ['updateNetElement', () => api.updateNetElement(net.name, segment, net.elements[segment])],
        ['updateCorners', () => api.updateCorners(data.corners)],
        ['applyImport', () => api.applyImport('lengths.csv', `net,layer,length\n${net.name},L1_TOP,10mm\n`)],
        ['editProject', () => api.editProject({ op: 'deleteNet', name: net.name })],
        ['applySuggestedTermination', () => api.applySuggestedTermination('LB_D7')],
        ['undo', () => api.undo()],
        ['redo', () => api.redo()],
        ['importIbis', () => api.importIbis('x.ibs', '[IBIS Ver] 5.0\n')],
        ['setWaiver', () => api.setWaiver(net.name, { comment: 'accepted', author: 'reviewer' })],
        ['removeWaiver', () => api.removeWaiver(net.name)],
      ];
      for (const [name, call] of edits) {
        await expect(call(), name).rejects.toThrow(new RegExp(`^project demo\\.slackline: is open read-only \\(${REASON}\\); edits are off: .+ was refused and nothing was written$`));
      }
      // The project as it was: same data, and reading, previews and solving still answer.
      expect((await api.getProject()).data).toEqual(data);
      const preview = await api.previewImport('lengths.csv', `net,layer,length\n${net.name},L1_TOP,10mm\n`);
      expect(preview.file).toBe('lengths.csv');
      const solved = await api.solveNet(net.name);
      expect(solved.net).toBe(net.name);
      // A what-if sweep stores nothing either: it runs (docs/workbench.md, "Read-only projects").
      const swept = await api.sweepNet('DQ12', { quantity: { kind: 'length', elementIndex: 2 }, start: 0.02, stop: 0.12, points: 3 });
      expect(swept.points).toHaveLength(3);
    } finally {
      await bench.close();
    }
    expect(hashOf(path)).toBe(before); // nothing written, not even results (docs/reliability.md §3)
  });

  it('carries the refusal through dispatch as an input failure with its place', async () => {
    const path = createDemo(join(dir, 'b'));
    const bench = await openWorkbench(path, { store: { readOnly: true } });
    try {
      const outcome = await dispatchApiCall(bench.api as SlacklineApi, 'undo', []);
      expect(outcome).toEqual({ ok: false, error: { kind: 'input', where: 'project demo.slackline', message: expect.stringContaining(`read-only (${REASON})`) } });
    } finally {
      await bench.close();
    }
  });

  it('a writable project says null; a session opens only its first project read-only', async () => {
    const first = createDemo(join(dir, 'c'));
    const second = createDemo(join(dir, 'd'));
    const writable = await openWorkbench(second);
    try {
      expect((await writable.api.getProject()).readOnly).toBeNull();
    } finally {
      await writable.close();
    }
    const session = await openWorkbenchSession(first, folderPlacement(join(dir, 'c')), { firstReadOnly: true });
    try {
      expect((await session.current.api.getProject()).readOnly).toBe(REASON);
      await session.switchTo(second); // a project opened afterwards (a new one) is as writable as its file
      expect((await session.current.api.getProject()).readOnly).toBeNull();
    } finally {
      await session.close();
    }
  });
});

/**
 * The project file keeps a bus's corner pairing (migration 009) and a receiver's slew-rate derating
 * table (migration 010), and a project without them reads back without them (behaviour, no source).
 */
import { afterAll, describe, expect, it } from 'vitest';
import { mkdtempSync, rmSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { ProjectStore } from '../../../main/services/project/project-store.js';
import { buildDemoProject } from '../../../fixtures/demo/demo-project.js';

const dir = mkdtempSync(join(tmpdir(), 'slackline-budget-fields-'));
afterAll(() => rmSync(dir, { recursive: true, force: true }));

describe('budget fields in the project file', () => {
  it('stores and reads back a corner pairing list, "cross", and a derating table', () => {
    const p = buildDemoProject();
    p.buses[0].cornerPairing = [{ silicon: 'fast', board: 'slow' }];
    p.buses[1].cornerPairing = 'cross';
    const derating = { signalSlews: [1e9, 2e9], strobeSlews: [2e9, 4e9], setup: [[4e-11, 3e-11], [2e-11, 1e-11]], hold: [[3e-11, 2.6e-11], [1e-11, 6e-12]] };
    const mem = p.parts.find((x) => x.name === 'MEM-DQ')!;
    mem.receiver = { ...mem.receiver!, derating };
    const path = join(dir, 'a.slackline');
    ProjectStore.create(path, p).close();
    const store = ProjectStore.open(path);
    try {
      const back = store.load();
      expect(back.buses[0].cornerPairing).toEqual([{ silicon: 'fast', board: 'slow' }]);
      expect(back.buses[1].cornerPairing).toBe('cross');
      expect(back.buses[2].cornerPairing).toBeUndefined();
      expect(back.parts.find((x) => x.name === 'MEM-DQ')!.receiver!.derating).toEqual(derating);
      expect(back.parts.find((x) => x.name === 'MC-DQ')!.receiver!.derating).toBeUndefined();
    } finally {
      store.close();
    }
  });
});

/**
 * IBIS through the service API every host serves (docs/ibis.md): importIbis stores a file only when
 * all of it parses (a malformed file names its line and keyword and leaves the project untouched),
 * and getPartIbisCurves gives the V-I and V-T data the workbench draws. Board: fixtures/ibis-board
 * (invented), built with `slackline new --from`. Behaviour, no numeric source needed beyond the file's
 * own tables.
 */
import { afterAll, describe, expect, it } from 'vitest';
import { mkdtempSync, readFileSync, rmSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { main } from '../../../main/cli/index.js';
import { openWorkbench } from '../../../main/services/compose.js';

const dir = mkdtempSync(join(tmpdir(), 'slackline-ibis-api-'));
afterAll(() => rmSync(dir, { recursive: true, force: true }));
const fixture = (name: string) => new URL(`../../../fixtures/${name}`, import.meta.url).pathname;
const quiet = { out: () => {}, err: () => {} };

describe('IBIS through the service API', () => {
  it('imports a whole file, refuses a malformed one with its line, and gives a part model\'s curves', async () => {
    const path = join(dir, 'board.slackline');
    expect(await main(['new', path, '--from', fixture('ibis-board/ibis-board.design.yaml')], quiet)).toBe(0);
    const bench = await openWorkbench(path, { solve: { workers: 0 } });
    try {
      const text = readFileSync(fixture('ibis/heron_m4.ibs'), 'utf8');
      const stored = await bench.api.importIbis('heron_m4.ibs', text);
      expect(stored).toMatchObject({ name: 'heron_m4.ibs', replaced: true });
      expect(stored.sha256).toMatch(/^[0-9a-f]{64}$/);

      const before = await bench.api.getProject();
      const broken = text.replace('[GND Clamp]', '[GND Clamp]\n 0.0 nonsense 1 2');
      await expect(bench.api.importIbis('heron_m4.ibs', broken)).rejects.toThrow(/heron_m4\.ibs line \d+/);
      expect((await bench.api.getProject()).data).toEqual(before.data);

      const part = before.data.parts.find((p) => p.ibis)!;
      const curves = await bench.api.getPartIbisCurves(part.name, before.data.corners[0].name);
      expect(curves).not.toBeNull();
      expect(JSON.stringify(curves)).toContain('"v"');
      await expect(bench.api.getPartIbisCurves('NO-SUCH-PART', 'typical')).rejects.toThrow(/part NO-SUCH-PART: not in the project/);
    } finally {
      await bench.close();
    }
  });
});

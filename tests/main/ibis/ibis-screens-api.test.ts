/**
 * What the workbench's IBIS screens use of the service API (docs/ibis.md §9, docs/workbench.md
 * "Parts: IBIS buffer models"): getProject lists each stored file by name, SHA-256, size and the
 * `slackline ibis` summary, never its text; a malformed import leaves the stored project exactly as it
 * was; editProject setPartIbis stores exactly the chosen file and model (or removes it), is undoable,
 * and a model the file does not have is refused naming the part's field. Board: the invented demo
 * project with the invented fixtures/ibis/wren_mc7.ibs imported.
 */
import { afterAll, describe, expect, it } from 'vitest';
import { createHash } from 'node:crypto';
import { mkdtempSync, readFileSync, rmSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { createDemo, openWorkbench } from '../../../main/services/compose.js';
import { ProjectStore } from '../../../main/services/project/project-store.js';
import { parseArguments, PayloadError } from '../../../main/services/api/schemas.js';
import { parseIbis } from '../../../core/ibis/parse.js';
import { summariseIbis } from '../../../core/ibis/summary.js';
import type { ProjectData } from '../../../core/project/model.js';

const dir = mkdtempSync(join(tmpdir(), 'slackline-ibis-screens-'));
afterAll(() => rmSync(dir, { recursive: true, force: true }));
const WREN = readFileSync(new URL('../../../fixtures/ibis/wren_mc7.ibs', import.meta.url), 'utf8');

/** The project as stored, texts included, read through a second handle on the file. */
function storedProject(path: string): ProjectData {
  const store = ProjectStore.open(path);
  try {
    return store.load();
  } finally {
    store.close();
  }
}

describe('IBIS screens through SlacklineApi', () => {
  it('refuses a malformed setPartIbis edit before it reaches the service', () => {
    expect(() => parseArguments('editProject', [{ op: 'setPartIbis', part: 'A' }])).toThrow(PayloadError);
    expect(() => parseArguments('editProject', [{ op: 'setPartIbis', part: 'A', ibis: { file: 'x.ibs' } }])).toThrow(PayloadError);
    expect(parseArguments('editProject', [{ op: 'setPartIbis', part: 'A', ibis: null }])).toEqual([{ op: 'setPartIbis', part: 'A', ibis: null }]);
  });

  it('lists stored files without their text, refuses a malformed file leaving the store untouched, and sets a part model undoably', async () => {
    const path = createDemo(join(dir, 'a'));
    const bench = await openWorkbench(path, { solve: { workers: 0 } });
    try {
      const { api } = bench;
      await api.importIbis('wren_mc7.ibs', WREN);

      // Listing: name, SHA-256 of the text (FIPS 180-4, node's crypto as the reference), size and summary; no text.
      const summary = await api.getProject();
      const listed = summary.data.ibisFiles ?? [];
      expect(listed.map((f) => f.name)).toEqual((storedProject(path).ibisFiles ?? []).map((f) => f.name));
      expect(listed.find((f) => f.name === 'wren_mc7.ibs')).toEqual({
        name: 'wren_mc7.ibs',
        sha256: createHash('sha256').update(WREN).digest('hex'),
        characters: WREN.length,
        // The summary `slackline ibis` prints (docs/ibis.md §6), as JSON crosses the transport.
        summary: JSON.parse(JSON.stringify(summariseIbis(parseIbis(WREN, 'wren_mc7.ibs')))),
        problem: null,
      });
      const wire = JSON.stringify(summary);
      expect(wire).not.toContain('[Pulldown]'); // a keyword of the file's text (fixtures/ibis/wren_mc7.ibs)
      expect(wire).not.toContain('"text"');
      // The services still read the text from the store (the project file keeps it whole).
      expect(storedProject(path).ibisFiles?.find((f) => f.name === 'wren_mc7.ibs')?.text).toBe(WREN);

      // A malformed file: refused with file, line and keyword; the stored project is exactly as before.
      const before = storedProject(path);
      const lines = WREN.split('\n');
      const row = lines.findIndex((l) => /^\[Pulldown\]/i.test(l.trim())) + 2; // a data row under [Pulldown]
      lines[row] = `${lines[row]} 1.0`; // five columns where four belong (docs/ibis.md §1)
      const broken = await api.importIbis('wren_mc7.ibs', lines.join('\n')).then(() => null, (e: unknown) => e as Error & { where?: string });
      expect(broken?.message).toMatch(new RegExp(`^wren_mc7\\.ibs line ${row + 1} \\[Pulldown\\]: malformed table row`));
      expect(storedProject(path)).toEqual(before);

      // Choose dq_drv40 for a part that drives and receives: exactly that is stored, the linear fields kept.
      const part = before.parts.find((p) => p.driver && p.receiver && !p.ibis)!;
      const after = await api.editProject({ op: 'setPartIbis', part: part.name, ibis: { file: 'wren_mc7.ibs', model: 'dq_drv40' } });
      expect(after.data.parts.find((p) => p.name === part.name)).toEqual({ ...part, ibis: { file: 'wren_mc7.ibs', model: 'dq_drv40' } });
      expect(storedProject(path).parts.find((p) => p.name === part.name)?.ibis).toEqual({ file: 'wren_mc7.ibs', model: 'dq_drv40' });
      expect((await api.getEditHistory()).undo[0]).toMatchObject({ action: 'set-part-ibis', detail: `part ${part.name} buffer model: linear -> dq_drv40 (wren_mc7.ibs)` });

      // The curves of the chosen model at every project corner (docs/ibis.md §9 corners -> columns).
      for (const corner of before.corners) {
        const curves = await api.getPartIbisCurves(part.name, corner.name);
        expect(curves?.model).toBe('dq_drv40');
        expect(curves?.rising.length).toBe(2); // fixtures/ibis/wren_mc7.ibs: two rising waveforms for dq_drv40
      }

      // A model the file does not have: refused naming the part's field; nothing changes.
      const held = storedProject(path);
      await expect(api.editProject({ op: 'setPartIbis', part: part.name, ibis: { file: 'wren_mc7.ibs', model: 'no_such' } }))
        .rejects.toThrow(new RegExp(`part ${part.name} ibis\\.model: unknown model name "no_such"`));
      await expect(api.editProject({ op: 'setPartIbis', part: part.name, ibis: { file: 'other.ibs', model: 'dq_drv40' } }))
        .rejects.toThrow(new RegExp(`part ${part.name} ibis\\.file: IBIS file "other\\.ibs" is not in the project`));
      expect(storedProject(path)).toEqual(held);

      // None: the key goes (the part is as it was before the model was chosen); undo brings the model back.
      await api.editProject({ op: 'setPartIbis', part: part.name, ibis: null });
      expect(storedProject(path).parts.find((p) => p.name === part.name)).toEqual(part);
      await api.undo();
      expect(storedProject(path).parts.find((p) => p.name === part.name)?.ibis).toEqual({ file: 'wren_mc7.ibs', model: 'dq_drv40' });
      await api.undo();
      expect(storedProject(path).parts.find((p) => p.name === part.name)).toEqual(part);
    } finally {
      await bench.close();
    }
  });
});

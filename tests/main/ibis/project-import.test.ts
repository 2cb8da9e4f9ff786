/**
 * IBIS files in a project file (docs/ibis.md §9, migration 008): `ProjectStore.importIbis` stores the
 * text and its SHA-256 after a full parse, a part names a model of it and reads back; a malformed
 * file writes nothing and names line and keyword, through the store and through
 * `slackline ibis FILE --into PROJECT` (exit 2). Files: the invented fixtures/ibis models.
 */
import { createHash } from 'node:crypto';
import { readFileSync, writeFileSync } from 'node:fs';
import { afterEach, beforeEach, describe, expect, it } from 'vitest';
import { buildLinearDemoProject as buildDemoProject } from '../../../fixtures/demo/demo-project.js';
import { main } from '../../../main/cli/index.js';
import { ProjectStore } from '../../../main/services/project/project-store.js';
import { buildNetCircuit } from '../../../core/netbuild/index.js';
import { expectSoundProject, fileHash, makeTempDir } from '../db/temp-files.js';

const IBS = new URL('../../../fixtures/ibis/wren_mc7.ibs', import.meta.url).pathname;
const wren = readFileSync(IBS, 'utf8');

/** wren_mc7.ibs with its second [Pulldown] data row cut to 3 columns; returns the text and that 1-based line. */
function malformed(): { text: string; line: number } {
  const lines = wren.split('\n');
  const row = lines.findIndex((l) => l.startsWith('[Pulldown]')) + 3;
  lines[row] = lines[row].split(/\s+/).filter(Boolean).slice(0, 3).join('  ');
  return { text: lines.join('\n'), line: row + 1 };
}

let tmp: ReturnType<typeof makeTempDir>;
let path: string;
beforeEach(() => {
  tmp = makeTempDir('slackline-ibis-import-');
  path = tmp.file('board.slk');
  ProjectStore.create(path, buildDemoProject()).close();
});
afterEach(() => tmp.remove());

describe('importing IBIS files into a project', () => {
  it('stores text and SHA-256, and a part using a model reads back and builds', async () => {
    const store = ProjectStore.open(path);
    try {
      const r = store.importIbis('/somewhere/wren_mc7.ibs', wren);
      // Node's OpenSSL SHA-256 of the same text as the reference.
      expect(r).toEqual({ name: 'wren_mc7.ibs', sha256: createHash('sha256').update(wren).digest('hex'), models: ['dq_drv40', 'dq_drv60', 'ck_ramp'], replaced: false });
      const part = store.load().parts.find((p) => p.driver !== null)!;
      store.upsertPart({ ...part, ibis: { file: 'wren_mc7.ibs', model: 'dq_drv40' } });
    } finally {
      store.close();
    }
    const again = ProjectStore.open(path);
    try {
      const data = again.load();
      expect(data.ibisFiles).toEqual([{ name: 'wren_mc7.ibs', sha256: createHash('sha256').update(wren).digest('hex'), text: wren }]);
      const part = data.parts.find((p) => p.ibis)!;
      expect(part.ibis).toEqual({ file: 'wren_mc7.ibs', model: 'dq_drv40' });
      const net = data.nets.find((n) => n.driver.part === part.name && !n.elements.some((e) => e.kind === 'segment' && e.spacing !== undefined))!;
      const c = buildNetCircuit(net, data.stackup, data.parts, data.corners[0], {}, data.ibisFiles);
      expect(c.driver.pad?.label).toMatch(/^wren_mc7\.ibs dq_drv40 /);
      // An upsert naming a model the file does not have is refused by name.
      expect(() => again.upsertPart({ ...part, ibis: { file: 'wren_mc7.ibs', model: 'no_such' } })).toThrow(/unknown model name "no_such"/);
    } finally {
      again.close();
    }
    await expectSoundProject(path);
  });

  it('writes nothing for a malformed file and names line and keyword', async () => {
    const before = fileHash(path);
    const store = ProjectStore.open(path);
    const bad = malformed();
    try {
      expect(() => store.importIbis('bad.ibs', bad.text)).toThrow(`bad.ibs line ${bad.line} [Pulldown]`);
      expect(store.load().ibisFiles).toBeUndefined();
      expect(store.changeLog(5).some((e) => e.action === 'import-ibis')).toBe(false);
    } finally {
      store.close();
    }
    // All-or-nothing: the file's bytes are those before the attempt (the parse fails before any write).
    expect(fileHash(path)).toBe(before);
  });

  it('slackline ibis FILE --into PROJECT stores the file, and exits 2 on a malformed one with nothing written', async () => {
    let out = '';
    let err = '';
    const io = { out: (t: string) => void (out += `${t}\n`), err: (t: string) => void (err += `${t}\n`) };
    expect(await main(['ibis', IBS, '--into', path], io)).toBe(0);
    expect(out).toMatch(/stored wren_mc7\.ibs in .*board\.slk \(sha256 [0-9a-f]{64}\)/);
    const bad = malformed();
    const badFile = tmp.file('bad.ibs');
    writeFileSync(badFile, bad.text);
    const before = fileHash(path);
    expect(await main(['ibis', badFile, '--into', path], io)).toBe(2);
    expect(err).toContain(`line ${bad.line} [Pulldown]`);
    expect(fileHash(path)).toBe(before);
    const store = ProjectStore.open(path, { readOnly: true });
    try {
      expect(store.load().ibisFiles?.map((f) => f.name)).toEqual(['wren_mc7.ibs']);
    } finally {
      store.close();
    }
  });
});

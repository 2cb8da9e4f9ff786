import { readFileSync, writeFileSync } from 'node:fs';
import { fileURLToPath } from 'node:url';
import { afterEach, beforeEach, describe, expect, it } from 'vitest';
import { ProjectStore } from '../../../main/services/project/project-store.js';
import { createDemoProject } from '../../../main/services/project/demo.js';
import { main } from '../../../main/cli/index.js';
import type { NetElement } from '../../../core/project/model.js';
import { expectSoundProject, fileHash, makeTempDir } from '../db/temp-files.js';

const FIXTURE = fileURLToPath(new URL('../../../fixtures/lengths/demo-lengths.csv', import.meta.url));
const fixtureText = readFileSync(FIXTURE, 'utf8');

function segment(store: ProjectStore, net: string, index: number): Extract<NetElement, { kind: 'segment' }> {
  const element = store.load().nets.find((n) => n.name === net)!.elements[index];
  if (element.kind !== 'segment') throw new Error(`${net} element ${index} is ${element.kind}`);
  return element;
}

/** Runs the CLI in-process and captures its output. */
async function cli(...argv: string[]): Promise<{ status: number; out: string; err: string }> {
  let out = '';
  let err = '';
  const status = await main(argv, { out: (t) => (out += `${t}\n`), err: (t) => (err += `${t}\n`) });
  return { status, out, err };
}

describe('length import on a real project file', () => {
  let temp: ReturnType<typeof makeTempDir>;
  let path: string;
  beforeEach(() => {
    temp = makeTempDir('slackline-import-');
    path = createDemoProject(temp.dir, { author: 'tester' });
  });
  afterEach(() => temp.remove());

  it('previews the demo report without writing anything', () => {
    const store = ProjectStore.open(path);
    const before = store.load();
    const preview = store.previewImport('demo-lengths.csv', fixtureText);
    // Expected statuses: fixtures/lengths/README.md (worked out from the demo's topology).
    expect(preview.rows.map((r) => `${r.line} ${r.net} ${r.status}`)).toEqual([
      '4 DQ0 matched', '5 DQ0 changed', '6 DQ0 matched', '7 DQ0 new', '8 DQ1 matched', '9 DQ45 changed',
      '10 A13 changed', '11 CK0 matched', '12 DQ2 unknown-layer', '13 GPIO7 unknown-net',
    ]);
    expect(preview.counts).toEqual({ matched: 4, changed: 3, new: 1, 'unknown-layer': 1, 'unknown-net': 1 });
    expect(preview.applied).toBe(false);
    // 1535 mil = 38.989 mm (1 mil = 25.4 um exactly); previous is the demo's 38.5 mm.
    expect(preview.rows[1].length).toBeCloseTo(38.989e-3, 12);
    expect(preview.rows[1].previous).toBe(38.5e-3);
    expect(store.load()).toStrictEqual(before);
    expect(store.changeLog(10)).toHaveLength(1); // only the creation
    store.close();
  });

  it('applies the changed lengths in one transaction and logs the import', () => {
    const store = ProjectStore.open(path, { author: 'importer' });
    const before = store.load();
    const result = store.applyImport('demo-lengths.csv', fixtureText);
    expect(result.applied).toBe(true);
    expect(segment(store, 'DQ0', 2).length).toBeCloseTo(1535 * 25.4e-6, 15);
    expect(segment(store, 'DQ45', 2).length).toBe(70e-3);
    expect(segment(store, 'A13', 2).length).toBeCloseTo(31.75e-3, 15);
    // Nothing else moved: undo the three changes and compare with the project before.
    const after = store.load();
    for (const [net, index] of [['DQ0', 2], ['DQ45', 2], ['A13', 2]] as const) {
      const n = after.nets.find((x) => x.name === net)!;
      n.elements[index] = before.nets.find((x) => x.name === net)!.elements[index];
    }
    expect(after).toStrictEqual(before);
    expect(store.changeLog(1)).toMatchObject([
      { author: 'importer', action: 'import-lengths', detail: 'demo-lengths.csv: 4 matched, 3 changed, 1 new, 1 unknown-layer, 1 unknown-net' },
    ]);
    // A second import of the same report finds everything already in place.
    expect(store.previewImport('demo-lengths.csv', fixtureText).counts.changed).toBe(0);
    expect(store.integrityCheck()).toBe('ok');
    store.close();
  });

  it('refuses a report with errors as a whole, naming file, line and column', () => {
    const bad = `${fixtureText}DQ3,L3_SIG,41mm,\nDQ4,L3_SIG,41,\nDQ5,L3_SIG,41mm,0.1 furlong\n`;
    const store = ProjectStore.open(path);
    const before = store.load();
    const hashBefore = store.changeLog(100);
    const result = store.applyImport('bad.csv', bad);
    expect(result.applied).toBe(false);
    expect(result.errors).toEqual([
      'bad.csv line 15 column 3 (length): "41" has no unit; write it as e.g. 41mil or name the column length_mil',
      expect.stringMatching(/^bad\.csv line 16 column 4 \(width\): unknown length unit "furlong"/),
    ]);
    expect(store.load()).toStrictEqual(before);
    expect(store.changeLog(100)).toStrictEqual(hashBefore);
    expect(store.integrityCheck()).toBe('ok');
    store.close();
  });

  it('reads a report with a byte-order mark, CRLF line ends and units in the header', () => {
    const store = ProjectStore.open(path);
    const text = '\ufeffNet,Layer,Length_mil,Width_mil\r\nDQ0,L3_SIG,1535,4.134\r\n\r\nDQ1,L3_SIG,1563,\r\n';
    const result = store.applyImport('crlf.csv', text);
    expect(result.errors).toEqual([]);
    expect(result.rows.map((r) => [r.line, r.status])).toEqual([[2, 'changed'], [4, 'changed']]);
    expect(segment(store, 'DQ0', 2).length).toBeCloseTo(1535 * 25.4e-6, 15); // 1 mil = 25.4 um exactly
    expect(segment(store, 'DQ0', 2).width).toBeCloseTo(4.134 * 25.4e-6, 15);
    expect(segment(store, 'DQ1', 2).width).toBe(0.105e-3); // no width given: kept
    expect(store.integrityCheck()).toBe('ok');
    store.close();
  });

  it('numbers lines right around comments, blank lines and a quoted field spanning two lines', () => {
    const store = ProjectStore.open(path);
    const text = [
      '# exported for review', 'net,layer,length,note', '', 'DQ0,L3_SIG,1535mil,"routed',
      'by hand"', ',,,', 'DQ1,L3_SIG,12', '"DQ2",L3_SIG,1,"say ""hi"""',
    ].join('\n');
    const preview = store.previewImport('multi.csv', text);
    expect(preview.errors).toEqual([
      'multi.csv line 7 column 3 (length): "12" has no unit; write it as e.g. 12mil or name the column length_mil',
      'multi.csv line 8 column 3 (length): "1" has no unit; write it as e.g. 1mil or name the column length_mil',
    ]);
    expect(preview.rows.map((r) => [r.line, r.net])).toEqual([[5, 'DQ0']]); // a record is numbered by its last line
    // The same rows, one per line: the fast numbering path gives the same lines.
    const flat = ['# exported for review', 'net,layer,length,note', '', 'DQ0,L3_SIG,1535mil,routed by hand', '', ',,,', 'DQ1,L3_SIG,12'].join('\n');
    expect(store.previewImport('flat.csv', flat).errors).toEqual([
      'flat.csv line 7 column 3 (length): "12" has no unit; write it as e.g. 12mil or name the column length_mil',
    ]);
    store.close();
  });

  it('reports a broken quote with its line instead of guessing', () => {
    const store = ProjectStore.open(path);
    const preview = store.applyImport('q.csv', 'net,layer,length\nDQ0,L1_TOP,3mm\n"DQ1,L1_TOP,3mm\n');
    expect(preview.applied).toBe(false);
    // The opening quote is on line 3, in the first column.
    expect(preview.errors).toEqual([expect.stringMatching(/^q\.csv line 3 column 1: Quote Not Closed/)]);
    store.close();
  });

  it('CLI: --dry-run prints the preview and leaves the file byte-identical', async () => {
    const hash = fileHash(path);
    const run = await cli('import', path, FIXTURE, '--dry-run');
    expect(run.status).toBe(0);
    expect(run.out).toContain('demo-lengths.csv: 4 matched, 3 changed, 1 new, 1 unknown-layer, 1 unknown-net');
    expect(run.out).toContain('line 5: DQ0 on L3_SIG: 38.500 mm -> 38.989 mm (1535.0 mil)');
    expect(run.out).toContain('Dry run: nothing was written.');
    expect(fileHash(path)).toBe(hash);
  });

  it('CLI: applies, prints JSON in metres, and exits 2 with every error on a bad report', async () => {
    const json = await cli('import', path, FIXTURE, '--json');
    expect(json.status).toBe(0);
    const preview = JSON.parse(json.out) as { applied: boolean; rows: { net: string; length: number }[] };
    expect(preview.applied).toBe(true);
    expect(preview.rows.find((r) => r.net === 'DQ45')!.length).toBe(0.07);

    const badCsv = temp.file('bad.csv');
    writeFileSync(badCsv, 'net,layer,length\nDQ0,L1_TOP,3\nDQ1,,3mm\n');
    const hash = fileHash(path);
    const bad = await cli('import', path, badCsv);
    expect(bad.status).toBe(2);
    expect(bad.err).toContain('bad.csv line 2 column 3 (length): "3" has no unit');
    expect(bad.err).toContain('bad.csv line 3 column 2 (layer): the layer name is empty');
    expect(bad.err).toContain('nothing was written');
    expect(fileHash(path)).toBe(hash);

    const missing = await cli('import', path, temp.file('nope.csv'));
    expect(missing.status).toBe(2);
    expect(missing.err).toMatch(/nope\.csv: file not found/);
    await expectSoundProject(path);
  });
});

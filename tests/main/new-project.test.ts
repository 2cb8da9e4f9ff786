/**
 * createProject through the service API (docs/workbench.md §New project) on a session the way the
 * browser shell opens it: new files only in the folder of the first project, by plain file name.
 * Expectations: docs/design-file.md §7 (every problem with file, line, column and field; a design with
 * any problem writes nothing; an existing file is never replaced) and §1 (the project holds what the
 * design describes). Places are found in the test's own text by plain string search (independent of
 * the YAML library). Other rules (file names, the switch of the open project) are common practice, no source.
 */
import { afterEach, beforeEach, describe, expect, it } from 'vitest';
import { existsSync, mkdtempSync, readdirSync, readFileSync, rmSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join, resolve } from 'node:path';
import { createDemo, createProjectFromDesignFile, folderPlacement, openWorkbenchSession, type WorkbenchSession } from '../../main/services/compose.js';
import { dispatchApiCall } from '../../main/services/api/dispatch.js';
import { STARTING_CORNERS } from '../../core/project/empty.js';
import { ProjectStore } from '../../main/services/project/project-store.js';

const root = resolve(__dirname, '..', '..');
const DESIGN_PATH = join(root, 'fixtures', 'ibis-board', 'ibis-board.design.yaml');
const DESIGN = readFileSync(DESIGN_PATH, 'utf8');
const WREN = readFileSync(join(root, 'fixtures', 'ibis', 'wren_mc7.ibs'), 'utf8');
const HERON = readFileSync(join(root, 'fixtures', 'ibis', 'heron_m4.ibs'), 'utf8');

/** A tiny board of this test's own invention (no IBIS files). */
const MINI = `version: 1
project: {name: Tiny board, boardRevision: B}
stackup:
  layers:
    - {name: TOP, kind: copper, role: signal, thickness: 0.035mm, defaultWidth: 0.15mm}
    - {name: PP, kind: dielectric, thickness: 0.1mm, dk: 4}
    - {name: GND, kind: copper, role: plane, thickness: 0.035mm}
parts:
  - name: DRV
    driver: {vol: 0V, voh: 1.8V, routHigh: 30ohm, routLow: 30ohm, riseTime: 300ps, fallTime: 300ps, tcoMin: 1ns, tcoMax: 3ns, refLoad: {ohms: 50ohm, vtt: 0.9V}, vmeas: 0.9V}
  - name: RCV
    receiver: {cin: 2pF, vil: 0.63V, vih: 1.17V, vmaxAbs: 2.1V, vminAbs: -0.3V, tsetup: 1ns, thold: 0.5ns}
buses:
  - name: SLOW
    kind: common-clock
    referenceNet: CK
    timing: {cycleTime: 10ns}
    template:
      driver: {part: DRV, designator: U1}
      path:
        - trace: {layer: TOP, length: 50mm}
        - receiver: {part: RCV, designator: U2}
    nets:
      - {name: CK, role: clock}
      - {name: D0}
`;

/** 1-based "line:column" of the first `token` after `after` in `text` (plain text search). */
function placeOf(text: string, token: string, after = ''): { line: number; column: number } {
  const start = after ? text.indexOf(after) : 0;
  expect(start, `"${after}" occurs in the text`).toBeGreaterThanOrEqual(0);
  const at = text.indexOf(token, start + after.length);
  expect(at, `"${token}" occurs in the text`).toBeGreaterThanOrEqual(0);
  const lines = text.slice(0, at).split('\n');
  return { line: lines.length, column: lines[lines.length - 1].length + 1 };
}

let dir: string;
let folder: string;
let firstPath: string;
let session: WorkbenchSession;
/** The open demo project's files in its folder (with SQLite's -wal and -shm), before any test's own. */
let demoFiles: string[];

beforeEach(async () => {
  dir = mkdtempSync(join(tmpdir(), 'slackline-new-project-'));
  folder = join(dir, 'projects');
  firstPath = createDemo(folder);
  session = await openWorkbenchSession(firstPath, folderPlacement(folder));
  demoFiles = readdirSync(folder).sort();
});

afterEach(async () => {
  await session.close();
  rmSync(dir, { recursive: true, force: true });
});

const filesIn = () => readdirSync(folder).sort();
const api = () => session.current.api;

describe('createProject through the service API', { timeout: 60_000 }, () => {
  it('creates a project from a design file and its IBIS files, then opens it instead of the current one', async () => {
    const firstBytes = readFileSync(firstPath);
    // The browser gives only the picked file's name; the design names "../ibis/wren_mc7.ibs".
    const answer = await api().createProject({
      path: 'lane-board',
      design: { fileName: 'ibis-board.design.yaml', text: DESIGN, ibisFiles: [{ path: 'wren_mc7.ibs', text: WREN }, { path: 'heron_m4.ibs', text: HERON }] },
    });
    expect(answer.problems).toEqual([]);
    expect(answer.outcome).toBe('created');
    const created = join(folder, 'lane-board.slackline');
    expect(answer.path).toBe(created);
    // The fixture's text: one bus LANE0 with the nets DQS0, DQ0, DQ1 and two parts using two IBIS files.
    expect(answer.outline).toEqual({ name: 'IBIS lane test board', boardRevision: 'A', buses: 1, nets: 3, parts: 2, ibisFiles: ['wren_mc7.ibs', 'heron_m4.ibs'] });

    // The open project is the new one now; the old file was closed untouched.
    expect(session.current.projectPath).toBe(created);
    const summary = await api().getProject();
    expect(summary.path).toBe(created);
    expect(summary.data.buses.map((b) => b.name)).toEqual(['LANE0']);
    expect(summary.data.nets.map((n) => n.name)).toEqual(['DQS0', 'DQ0', 'DQ1']);
    expect(readFileSync(firstPath).equals(firstBytes)).toBe(true);

    // The same project as `slackline new --from` builds from the file on disk (one creation path, docs/design-file.md §1).
    const viaCli = join(dir, 'cli.slackline');
    createProjectFromDesignFile(viaCli, DESIGN_PATH);
    const store = ProjectStore.open(viaCli, { readOnly: true });
    const cliData = store.load();
    store.close();
    const apiStore = ProjectStore.open(created, { readOnly: true });
    const apiData = apiStore.load();
    apiStore.close();
    expect(apiData).toEqual(cliData);
  });

  it('creates an empty project with name and board revision and the starting corners', async () => {
    const answer = await api().createProject({ path: 'blank.slackline', empty: { name: '  Bench rig  ', boardRevision: 'C2' } });
    expect(answer.outcome).toBe('created');
    const data = (await api().getProject()).data;
    // Trimmed as typed; corners are core/project/empty.ts STARTING_CORNERS (what `slackline new` writes).
    expect(data.info.name).toBe('Bench rig');
    expect(data.info.boardRevision).toBe('C2');
    expect(data.corners).toEqual(STARTING_CORNERS);
    expect([data.buses.length, data.nets.length, data.parts.length, data.stackup.layers.length]).toEqual([0, 0, 0, 0]);
  });

  it('a malformed design lists every problem with line, column and field, and writes nothing', async () => {
    const before = filesIn();
    // Two faults: a bare number for a length (units are required, docs/design-file.md §2) and an unknown key.
    const bad = MINI.replace('length: 50mm', 'length: 50').replace('timing: {cycleTime: 10ns}', 'timing: {cycleTime: 10ns, cycletime: 9ns}');
    const answer = await api().createProject({ path: 'bad', design: { fileName: 'tiny.design.yaml', text: bad, ibisFiles: [] } });
    expect(answer.outcome).toBe('invalid');
    expect(answer.path).toBeNull();
    const lengthAt = placeOf(bad, '50', 'length: ');
    const keyAt = placeOf(bad, 'cycletime');
    expect(answer.problems).toHaveLength(2);
    // In file order (docs/design-file.md §7).
    expect(answer.problems[0]).toMatchObject({ file: 'tiny.design.yaml', ...keyAt, field: 'buses[0].timing.cycletime' });
    expect(answer.problems[1]).toMatchObject({ file: 'tiny.design.yaml', ...lengthAt, field: 'buses[0].template.path[0].trace.length' });
    expect(answer.problems[1].message).toMatch(/unit/);
    expect(filesIn()).toEqual(before);
    expect(session.current.projectPath).toBe(firstPath);
  });

  it('a YAML syntax error is placed (no field yet) and writes nothing', async () => {
    const bad = MINI.replace('    nets:\n', '    nets: [\n');
    const answer = await api().createProject({ path: 'broken', design: { fileName: 'tiny.design.yaml', text: bad, ibisFiles: [] } });
    expect(answer.outcome).toBe('invalid');
    expect(answer.problems.length).toBeGreaterThan(0);
    for (const p of answer.problems) {
      expect(p.field).toBeNull();
      // A place after the opening bracket's line (the unclosed flow sequence), inside the text.
      expect(p.line).toBeGreaterThanOrEqual(placeOf(bad, 'nets: [').line);
      expect(p.line).toBeLessThanOrEqual(bad.split('\n').length);
    }
    expect(filesIn()).toEqual(demoFiles);
  });

  it('names the IBIS files a design refers to that were not given, and writes nothing', async () => {
    const answer = await api().createProject({
      path: 'lane-board',
      design: { fileName: 'ibis-board.design.yaml', text: DESIGN, ibisFiles: [{ path: 'wren_mc7.ibs', text: WREN }] },
    });
    expect(answer.outcome).toBe('invalid');
    // As the fixture's ibisFiles write them.
    expect(answer.namedIbisFiles).toEqual(['../ibis/wren_mc7.ibs', '../ibis/heron_m4.ibs']);
    expect(answer.missingIbisFiles).toEqual(['../ibis/heron_m4.ibs']);
    // core/design places it at the entry's path value (ibisFiles[1].path).
    expect(answer.problems).toEqual([expect.objectContaining({ ...placeOf(DESIGN, '../ibis/heron_m4.ibs'), field: 'ibisFiles[1].path' })]);
    expect(filesIn()).toEqual(demoFiles);
  });

  it('a malformed IBIS file is refused naming the part, and writes nothing', async () => {
    const answer = await api().createProject({
      path: 'lane-board',
      design: { fileName: 'ibis-board.design.yaml', text: DESIGN, ibisFiles: [{ path: 'wren_mc7.ibs', text: WREN.replace('[Model]', '[Modle]') }, { path: 'heron_m4.ibs', text: HERON }] },
    });
    expect(answer.outcome).toBe('invalid');
    expect(answer.problems.length).toBeGreaterThan(0);
    expect(answer.problems.map((p) => p.field).join(' ')).toContain('part CTRL-DQ ibis');
    expect(filesIn()).toEqual(demoFiles);
  });

  it('refuses to replace an existing file (content unchanged, the open project stays)', async () => {
    writeFileSync(join(folder, 'taken.slackline'), 'someone else\'s file');
    const taken = await api().createProject({ path: 'taken', empty: { name: 'X' } });
    expect(taken).toMatchObject({ outcome: 'invalid', path: null });
    expect(taken.problems).toEqual([expect.objectContaining({ field: 'new project file taken.slackline', line: null })]);
    expect(taken.problems[0].message).toMatch(/exists already/);
    expect(readFileSync(join(folder, 'taken.slackline'), 'utf8')).toBe('someone else\'s file');
    // A project created once cannot be created again over itself either.
    expect((await api().createProject({ path: 'once', empty: { name: 'Once' } })).outcome).toBe('created');
    expect((await api().createProject({ path: 'once.slackline', empty: { name: 'Twice' } })).problems[0].message).toMatch(/exists already/);
    expect((await api().getProject()).data.info.name).toBe('Once');
  });

  it('the browser shell\'s folder takes plain file names only', async () => {
    for (const name of ['../escape', 'sub/inner', '/abs/path', '.hidden', 'x.db', 'a\\b']) {
      const answer = await api().createProject({ path: name, empty: { name: 'X' } });
      expect(answer.outcome, name).toBe('invalid');
      expect(answer.problems.map((p) => p.field), name).toEqual(['new project file name']);
    }
    expect((await api().createProject({ empty: { name: 'X' } })).problems).toEqual([expect.objectContaining({ field: 'new project file name', message: 'is required' })]);
    expect(filesIn()).toEqual(demoFiles);
    expect(existsSync(join(dir, 'escape.slackline'))).toBe(false);
    expect(await api().getNewProjectTarget()).toEqual({ kind: 'folder', folder });
  });

  it('checkOnly and an empty name write nothing; the payload check refuses design and empty together', async () => {
    const checked = await api().createProject({ path: 'mini', design: { fileName: 'tiny.design.yaml', text: MINI, ibisFiles: [] }, checkOnly: true });
    expect(checked).toMatchObject({ outcome: 'checked', problems: [], outline: { name: 'Tiny board', boardRevision: 'B', buses: 1, nets: 2, parts: 2 } });
    const unnamed = await api().createProject({ path: 'blank', empty: { name: '   ' } });
    expect(unnamed.outcome).toBe('invalid');
    expect(unnamed.problems).toEqual([expect.objectContaining({ field: 'name', message: 'is required', line: null })]);
    const both = await dispatchApiCall(api(), 'createProject', [{ path: 'x', empty: { name: 'X' }, design: { fileName: 'a.yaml', text: '', ibisFiles: [] } }]);
    expect(both.ok).toBe(false);
    expect(!both.ok && both.error.kind).toBe('payload');
    expect(filesIn()).toEqual(demoFiles);
  });
});

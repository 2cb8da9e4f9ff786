/**
 * End-to-end: the new-project screen (docs/workbench.md §New project) in the built renderer in
 * Debian's Chromium against the loopback HTTP shell (real services). From the demo project, create a
 * project from the invented IBIS lane board's design file (fixtures/ibis-board, not the demo) and its
 * two .ibs files; the workbench then shows that project's bus on the overview. A malformed design
 * file of the test's own shows its problems with line and column (found in the test's text by plain
 * string search) and writes nothing. Expectations: docs/design-file.md §7 (every problem placed,
 * nothing written) and §1 (the project holds what the design describes).
 */
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { readdirSync, readFileSync, writeFileSync } from 'node:fs';
import { join } from 'node:path';
import type { Page } from 'playwright-core';
import type { ServedProject } from '../../main/web/serve-project.js';
import { root, shot, startWorkbench, stopWorkbench, type Workbench } from './harness.js';

let bench: Workbench | undefined;
let served: ServedProject;
let page: Page;

beforeAll(async () => {
  bench = await startWorkbench();
  ({ served, page } = bench);
});

afterAll(async () => {
  await stopWorkbench(bench);
});

const DESIGN = join(root, 'fixtures', 'ibis-board', 'ibis-board.design.yaml');
const IBIS = ['wren_mc7.ibs', 'heron_m4.ibs'].map((f) => join(root, 'fixtures', 'ibis', f));

/** A small invented board with two faults: a bare number for a length (units are required) and an unknown key. */
const BAD = `version: 1
project: {name: Faulty bench board}
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
    timing: {cycleTime: 10ns, cycletime: 9ns}
    template:
      driver: {part: DRV, designator: U1}
      path:
        - trace: {layer: TOP, length: 50}
        - receiver: {part: RCV, designator: U2}
    nets:
      - {name: CK, role: clock}
      - {name: D0}
`;

/** 1-based "line:column" of the first `token` after `after` (plain text search). */
function placeOf(text: string, token: string, after = ''): string {
  const at = text.indexOf(token, after ? text.indexOf(after) + after.length : 0);
  expect(at, `"${token}" occurs in the text`).toBeGreaterThanOrEqual(0);
  const lines = text.slice(0, at).split('\n');
  return `${lines.length}:${lines[lines.length - 1].length + 1}`;
}

const SIZES = [[1440, 900], [1024, 768]] as const;

/** The screen as it is now, light and dark, at both window sizes (test-output only, never committed). */
async function screens(name: string): Promise<void> {
  for (const scheme of ['light', 'dark'] as const) {
    await page.emulateMedia({ colorScheme: scheme });
    for (const [width, height] of SIZES) {
      await page.setViewportSize({ width, height });
      await shot(page, `new-project-${name}-${scheme}-${width}`);
    }
  }
  await page.emulateMedia({ colorScheme: 'light' });
  await page.setViewportSize({ width: 1440, height: 900 });
}

describe('creating a project from the workbench', { timeout: 300_000 }, () => {
  let folder: string;
  let before: string[];

  it('opens the new-project screen from the sidebar; the browser shell names its folder', async () => {
    await page.setViewportSize({ width: 1440, height: 900 });
    await page.goto(served.shell.url);
    await page.getByTestId('bus-table').waitFor();
    await page.getByTestId('new-project-open').click();
    await page.getByTestId('new-project').waitFor();
    folder = served.newProjectFolder;
    await expect.poll(() => page.getByTestId('new-folder').textContent()).toBe(folder);
    before = readdirSync(folder).sort();
    await screens('start');
  });

  it('picks the design file: the IBIS files it names are listed as missing, by name, with their places', async () => {
    await page.getByTestId('new-design-file').setInputFiles(DESIGN);
    await page.getByTestId('new-problems').waitFor();
    const text = readFileSync(DESIGN, 'utf8');
    expect(await page.getByTestId('new-ibis-missing').textContent()).toContain('wren_mc7.ibs, heron_m4.ibs');
    expect(await page.getByTestId('new-ibis-wren_mc7.ibs').textContent()).toContain('missing');
    // Each missing file is also a problem at its ibisFiles entry's path (core/design places it there).
    const places = await page.getByTestId('new-problem-place').allTextContents();
    expect(places).toEqual([placeOf(text, '../ibis/wren_mc7.ibs'), placeOf(text, '../ibis/heron_m4.ibs')]);
    await screens('missing-ibis');
  });

  it('adds the .ibs files, then creates and opens the project: its bus is on the overview', async () => {
    await page.getByTestId('new-ibis-files').setInputFiles(IBIS);
    await page.getByTestId('new-checked').waitFor();
    expect(await page.getByTestId('new-ibis-heron_m4.ibs').textContent()).toContain('given');
    expect(await page.getByTestId('new-outline').textContent()).toContain('IBIS lane test board');
    // The file name is offered from the design's project name; the test chooses its own.
    await page.getByTestId('new-file-name').fill('lane-board.slackline');
    await screens('ready');
    await page.getByTestId('new-create').click();
    await page.getByTestId('open-bus-LANE0').waitFor();
    expect(await page.getByTestId('project-created').textContent()).toContain('IBIS lane test board');
    // The bus and nets of the fixture's text: LANE0 with DQS0, DQ0, DQ1 (fixtures/ibis-board/ibis-board.design.yaml).
    const created = join(folder, 'lane-board.slackline');
    expect(served.projectPath).toBe(created);
    const data = (await served.workbench.api.getProject()).data;
    expect(data.buses.map((b) => b.name)).toEqual(['LANE0']);
    expect(data.nets.map((n) => n.name)).toEqual(['DQS0', 'DQ0', 'DQ1']);
    expect(await page.locator('.project-name').textContent()).toContain('IBIS lane test board');
    expect(await page.getByTestId('bus-table').textContent()).not.toContain('LB_');
    await screens('created');
  });

  it('a malformed design file shows each problem with line, column and field, and writes nothing', async () => {
    const files = readdirSync(folder).sort();
    const badPath = join(bench!.work, 'faulty.design.yaml');
    writeFileSync(badPath, BAD);
    await page.getByTestId('new-project-open').click();
    await page.getByTestId('new-design-file').setInputFiles(badPath);
    await page.getByTestId('new-problems').waitFor();
    const rows = page.getByTestId('new-problem');
    expect(await rows.count()).toBe(2);
    expect(await page.getByTestId('new-problem-place').allTextContents()).toEqual([placeOf(BAD, 'cycletime'), placeOf(BAD, '50', 'length: ')]);
    expect(await rows.nth(0).textContent()).toContain('buses[0].timing.cycletime');
    expect(await rows.nth(1).textContent()).toContain('buses[0].template.path[0].trace.length');
    expect(await page.getByTestId('new-create').isDisabled()).toBe(true);
    await screens('problems');
    expect(readdirSync(folder).sort()).toEqual(files);
    expect(files.filter((f) => !before.includes(f)).filter((f) => f.endsWith('.slackline'))).toEqual(['lane-board.slackline']);
  });

  it('refuses an existing file name in the list, and an empty project opens with no buses', async () => {
    await page.getByTestId('new-kind-empty').check();
    await page.getByTestId('new-empty-name').fill('Bench rig');
    await page.getByTestId('new-empty-revision').fill('B1');
    await page.getByTestId('new-file-name').fill('lane-board');
    await page.getByTestId('new-create').click();
    await expect.poll(() => page.getByTestId('new-problems').textContent()).toContain('exists already');
    await page.getByTestId('new-file-name').fill('bench-rig');
    await page.getByTestId('new-create').click();
    await page.getByTestId('project-created').waitFor();
    expect(await page.locator('.project-name').textContent()).toContain('Bench rig');
    const data = (await served.workbench.api.getProject()).data;
    expect([data.info.name, data.info.boardRevision, data.buses.length]).toEqual(['Bench rig', 'B1', 0]);
    await screens('empty-created');
  });

  it('ran without console errors, CSP violations or failed requests', () => {
    // Refusals of a new project come back as listed problems (HTTP 200), so not even those log an error.
    expect(bench!.problems).toEqual([]);
  });
});

/**
 * End-to-end: the screens agree with the numbers, edits never rewrite data nobody touched, and the
 * waveforms can be read — in the built renderer in Debian's Chromium against the loopback HTTP shell
 * over a fresh copy of the demo project (real services: database, solver, budgets).
 * Expectations come from the workbench issue's acceptance list (stated beside each check) and the
 * budget definitions of docs/design.md §6 and docs/workbench.md.
 * Screenshots of every screen, light and dark, at 1440x900 and 1024x768 go to
 * test-output/screenshots/trust-*.png for people to look at.
 */
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import type { Page, Request } from 'playwright-core';
import Database from 'better-sqlite3';
import type { ServedProject } from '../../main/web/serve-project.js';
import type { NetResult } from '../../core/budget/results.js';
import { join } from 'node:path';
import { goTo, root, shot, solveAll, startWorkbench, stopWorkbench, type Workbench } from './harness.js';

/** The margin text the workbench prints (renderer/src/lib/format.ts margin): whole ps, sign, U+2212. */
function marginText(seconds: number): string {
  const ps = Math.round(seconds / 1e-12);
  return ps === 0 ? '0 ps' : `${ps < 0 ? '\u2212' : '+'}${Math.abs(ps)} ps`;
}

let bench: Workbench | undefined;
let served: ServedProject;
let page: Page;

/** Every API call the page made, by method name (to prove what was, and was not, sent). */
const calls: string[] = [];

beforeAll(async () => {
  bench = await startWorkbench();
  ({ served, page } = bench);
  page.on('request', (request: Request) => {
    const match = /\/api\/(\w+)$/.exec(new URL(request.url()).pathname);
    if (match) calls.push(match[1]);
  });
});

/** Rows of a project table as stored (every column but the row id, which a rewrite may renumber). */
function storedRows(table: string, order: string): Record<string, unknown>[] {
  const db = new Database(served.projectPath, { readonly: true, fileMustExist: true });
  try {
    return (db.prepare(`SELECT * FROM ${table} ORDER BY ${order}`).all() as Record<string, unknown>[]).map(({ id: _id, ...rest }) => rest);
  } finally {
    db.close();
  }
}
const count = (method: string) => calls.filter((c) => c === method).length;

afterAll(async () => {
  await stopWorkbench(bench);
});

const SIZES = [[1440, 900], [1024, 768]] as const;

/** The screen as it is now, light and dark, at both window sizes (test-output only, never committed). */
async function screens(name: string): Promise<void> {
  for (const scheme of ['light', 'dark'] as const) {
    await page.emulateMedia({ colorScheme: scheme });
    for (const [width, height] of SIZES) {
      await page.setViewportSize({ width, height });
      await page.waitForTimeout(150); // ResizeObserver redraws the charts on the next frame
      await shot(page, `trust-${name}-${scheme}-${width}`);
    }
  }
  await page.emulateMedia({ colorScheme: 'light' });
  await page.setViewportSize({ width: 1440, height: 900 });
}

/** Problems (console errors, CSP violations) seen since `from`. */
function problemsSince(from: number): string[] {
  return bench!.problems.slice(from);
}

function worstOf(nets: NetResult[]): NetResult {
  return [...nets].sort((a, b) => Math.min(a.setupMargin!, a.holdMargin!) - Math.min(b.setupMargin!, b.holdMargin!))[0];
}

// Generous: under `npm test` every suite shares two cores with this browser and the solver threads.
describe('workbench screens a reviewer can trust', { timeout: 300_000 }, () => {
  let net = '';
  let boardBeforeEdit: Awaited<ReturnType<typeof served.workbench.api.getResults>> = null;

  it('opens and solves the demo without a console error', async () => {
    await page.goto(served.shell.url);
    await page.getByTestId('bus-table').waitFor();
    await solveAll(page);
    const board = (await served.workbench.api.getResults())!;
    // A data net with more than one corner and both edges: the worst data net of the first bus.
    net = worstOf(board.buses[0].nets.filter((n) => n.role === 'data')).net;
    await screens('overview');
    expect(problemsSince(0)).toEqual([]);
  });

  it('shows the failing check\'s reason beside every fail badge on the overview', async () => {
    const board = (await served.workbench.api.getResults())!;
    const failing = board.buses.filter((b) => b.status !== 'pass');
    expect(failing.length).toBeGreaterThan(0); // the demo fails on purpose (fixtures/demo)
    for (const bus of failing) {
      const reason = page.locator(`[data-testid="bus-table"] tr:has([data-testid="open-bus-${bus.bus}"]) + tr.reason-row`);
      // issue: "a bus is 'fail' with positive margins and no reason shown on the overview"
      await expect.poll(() => reason.textContent()).toMatch(bus.status === 'fail' ? /^Fails: \S+: / : /^Tight: \S+: /);
      expect(await reason.textContent()).not.toMatch(/ -\d/); // minus signs as U+2212, like the tables
    }
  });

  it('margin table: a definition on every header, a reason on every fail row, the row agrees with the budget panel, strobe rows name their data net', async () => {
    const board = (await served.workbench.api.getResults())!;
    const bus = board.buses.find((b) => b.kind === 'source-synchronous' && b.nets.some((n) => n.status === 'fail')) ?? board.buses.find((b) => b.kind === 'source-synchronous')!;
    await goTo(page, `#/bus/${encodeURIComponent(bus.bus)}`);
    await page.getByTestId('margin-table').waitFor();
    const titles = await page.locator('[data-testid="margin-table"] thead th').evaluateAll((ths) => ths.map((th) => th.getAttribute('title') ?? ''));
    expect(titles.every((t) => t.length > 5)).toBe(true); // one definition per column (docs/workbench.md)
    for (const n of bus.nets.filter((x) => x.status === 'fail')) {
      await expect.poll(() => page.locator(`tr[data-net="${n.net}"] [data-testid="row-reason"]`).count()).toBe(1);
    }
    // Every timed net: the budget panel, opened on the row's worst corner, totals the row's worst margin.
    for (const n of bus.nets.filter((x) => !x.marginsFrom).slice(0, 3)) {
      await page.locator(`tr[data-net="${n.net}"] td`).nth(2).click();
      await expect.poll(() => page.getByTestId('budget-items').locator('h3').textContent()).toBe(`Budget of ${n.net}`);
      const rowWorst = (await page.locator(`tr[data-net="${n.net}"] [data-testid="worst-margin"]`).textContent())!.trim();
      const totals = await Promise.all(['setup', 'hold'].map(async (side) => (await page.getByTestId(`budget-${side}-total`).textContent())!.trim()));
      const asPs = (t: string) => Number(t.replace('\u2212', '-').replace(/[^\d.+-]/g, ''));
      expect(Math.min(...totals.map(asPs))).toBe(asPs(rowWorst)); // issue: row "fast" +3347 ps vs panel "fast (worst)" +5964 ps
    }
    const strobe = bus.nets.find((n) => n.role === 'strobe' && n.marginsFrom);
    if (strobe) {
      await page.locator(`tr[data-net="${strobe.net}"] td`).nth(2).click();
      const owner = /\(worst: ([^)\s]+)\)/.exec(strobe.marginsFrom!)![1];
      await expect.poll(() => page.getByTestId('budget-items').locator('h3').textContent()).toBe(`Budget of data net ${owner}, timed against ${strobe.net}`);
      expect(await page.locator(`tr[data-net="${strobe.net}"] [data-testid="worst-margin"]`).textContent()).toContain(`(${owner})`);
      await page.getByTestId('margins-owner').waitFor();
    }
    await screens('bus');
  });

  it('reaches the margin table in one Tab and keeps the focus when a net opens', async () => {
    const board = (await served.workbench.api.getResults())!;
    const bus = board.buses[0].bus;
    await goTo(page, '#/overview');
    await page.reload(); // a fresh page: the Tab order starts at the top
    await page.getByTestId('bus-table').waitFor();
    await page.keyboard.press('Tab');
    // Page-side code as text: this file compiles without DOM types.
    expect(await page.evaluate('document.activeElement.getAttribute("data-testid")')).toBe('skip-to-content');
    await page.getByTestId(`open-bus-${bus}`).press('Enter');
    await page.getByTestId('margin-table').waitFor();
    // The bus view puts the focus in the table body: arrows and Enter work at once (issue: 18 tabs to reach it).
    await expect.poll(() => page.evaluate('document.activeElement.closest("[data-testid=margin-table]") !== null')).toBe(true);
    await page.keyboard.press('Home');
    await page.keyboard.press('Enter');
    await page.locator('#net-title').waitFor();
    // issue: "focus lost after opening a net"
    await expect.poll(() => page.evaluate('document.activeElement.id')).toBe('net-title');
  });

  it('says per import row what will happen and why, in words', async () => {
    const data = (await served.workbench.api.getProject()).data;
    const dq = data.nets.find((n) => n.name === net)!;
    const seg = dq.elements.findIndex((e) => e.kind === 'segment');
    const el = dq.elements[seg] as { layer: string; length: number };
    const onLayer = dq.elements.filter((e) => e.kind === 'segment' && (e as { layer: string }).layer === el.layer).length;
    const mil = (m: number) => (m / 25.4e-6).toFixed(4);
    // Invented report: the first segment on that layer 100 mil longer, one row more than the net has
    // segments there, and a net the project does not hold.
    const lines = ['net,layer,length_mil', `${net},${el.layer},${mil(el.length + 100 * 25.4e-6)}`];
    for (let i = 1; i < onLayer; i++) lines.push(`${net},${el.layer},${mil((dq.elements.filter((e) => e.kind === 'segment' && (e as { layer: string }).layer === el.layer)[i] as { length: number }).length)}`);
    lines.push(`${net},${el.layer},500`, 'NOT_A_NET,L1_TOP,700');
    await goTo(page, '#/import');
    await page.getByTestId('import-text').fill(lines.join('\n'));
    await page.getByTestId('import-preview').click();
    await page.getByTestId('import-preview-panel').waitFor();
    await page.getByTestId('import-rule').waitFor();
    const why = (line: number) => page.getByTestId(`import-row-${line}`).getByTestId('import-why').textContent();
    // Line 2: the changed length, naming the element it sets (elements are numbered from 1 on screen).
    await expect.poll(() => why(2)).toMatch(new RegExp(`^1st row of ${net} on ${el.layer}: sets element ${seg + 1} from `));
    // The extra row and the unknown net: listed, not written, and why in words (the services' own
    // words when they give them, else the workbench's from the row's status).
    const verdict = (line: number) => page.getByTestId(`import-row-${line}`).locator('.verdict').textContent();
    expect(await verdict(lines.length - 1)).toMatch(/^not written/);
    expect(await why(lines.length - 1)).toMatch(new RegExp(`${net}.*${el.layer}`));
    expect(await verdict(lines.length)).toMatch(/^not written/);
    expect(await why(lines.length)).toContain('NOT_A_NET');
    const preview = await served.workbench.api.previewImport('lengths.csv', lines.join('\n'));
    const written = preview.rows.filter((r) => r.status === 'changed').length;
    await expect.poll(() => page.getByTestId('import-summary').textContent()).toMatch(new RegExp(`^\\s*Applying writes ${written} segment length`));
    await screens('import');
  });

  it('draws every corner and edge in its own colour and dash, with the driver pin on request', async () => {
    await goTo(page, `#/net/${encodeURIComponent(net)}`);
    await page.getByTestId('waveform-chart').waitFor();
    await page.getByTestId('wave-corner').selectOption('*');
    const corners = (await served.workbench.api.getProject()).data.corners.length;
    const items = page.getByTestId('wave-traces').locator('li');
    await expect.poll(() => items.count()).toBe(2 * corners); // issue: "All corners" draws every corner, both edges
    const styles = await items.evaluateAll((lis) => lis.map((li) => `${li.getAttribute('data-color')}|${li.getAttribute('data-dash')}`));
    expect(new Set(styles).size).toBe(styles.length); // issue: a distinct colour and dash per corner and edge
    await page.getByTestId('wave-driver').check();
    await expect.poll(() => items.count()).toBe(4 * corners);
    expect(await items.allTextContents()).toContain(`driver ${(await served.workbench.api.getProject()).data.nets.find((n) => n.name === net)!.driver.designator} rising (${(await served.workbench.api.getProject()).data.corners[0].name}): dotted line`);
    await screens('net-all-corners');
    await page.getByTestId('wave-driver').uncheck();
    await page.getByTestId('wave-corner').selectOption({ index: 0 });
    await expect.poll(() => items.count()).toBe(2);
  });

  it('zooms on the edge, zooms further with the wheel, and resets', async () => {
    const windowText = () => page.getByTestId('zoom-window').textContent();
    const span = (text: string | null) => {
      const m = /showing ([\d.]+) to ([\d.]+) ns/.exec(text ?? '');
      if (!m) throw new Error(`no zoom window in "${text}"`);
      return Number(m[2]) - Number(m[1]);
    };
    const opened = span(await windowText());
    const chart = page.getByTestId('waveform-chart').locator('canvas').first();
    const box = (await chart.boundingBox())!;
    await page.mouse.move(box.x + box.width * 0.3, box.y + box.height * 0.45);
    await page.mouse.wheel(0, -400); // ECharts inside zoom: wheel up zooms in
    await expect.poll(async () => span(await windowText())).toBeLessThan(opened);
    await page.getByTestId('reset-zoom').click();
    await expect.poll(async () => span(await windowText())).toBeCloseTo(opened, 6);
  });

  it('places two cursors and reads out delta-t', async () => {
    const chart = page.getByTestId('waveform-chart').locator('canvas').first();
    const box = (await chart.boundingBox())!;
    const readout = page.getByTestId('cursor-readout');
    await page.mouse.click(box.x + box.width * 0.3, box.y + box.height * 0.45);
    await expect.poll(() => readout.textContent()).toMatch(/^A [\d.]+ ns · click again/);
    await page.mouse.click(box.x + box.width * 0.6, box.y + box.height * 0.45);
    await expect.poll(() => readout.textContent()).toMatch(/Δt/);
    const text = (await readout.textContent()) ?? '';
    const m = /A ([\d.]+) ns · B ([\d.]+) ns · Δt = B − A = ([\d.]+) ns/.exec(text);
    expect(m, text).not.toBeNull();
    // readout arithmetic: Δt = B − A, each printed to 1 ps (0.001 ns); rounding of three numbers ≤ 0.0015 ns
    expect(Math.abs(Number(m![2]) - Number(m![1]) - Number(m![3]))).toBeLessThanOrEqual(0.0015);
    expect(Number(m![3])).toBeGreaterThan(0);
  });

  it('hovers the chart with its tooltip without a single console error or CSP violation', async () => {
    const before = bench!.problems.length;
    const chart = page.getByTestId('waveform-chart').locator('canvas').first();
    const box = (await chart.boundingBox())!;
    for (let i = 1; i < 10; i++) await page.mouse.move(box.x + (box.width * i) / 10, box.y + box.height * 0.5);
    await screens('net');
    // issue: "every hover logs ~42 console errors" — the canvas tooltip needs no inline style
    expect(problemsSince(before)).toEqual([]);
  });

  it('draws the chart on a dark background in the dark appearance', async () => {
    await page.emulateMedia({ colorScheme: 'dark' });
    await page.waitForTimeout(200);
    // Page-side code as text: this file compiles without DOM types. Pixel (3, 3) is chart background.
    const pixel = await page.evaluate(`(() => {
      const canvas = document.querySelector('[data-testid="waveform-chart"] canvas');
      const data = canvas.getContext('2d').getImageData(3, 3, 1, 1).data;
      return [data[0], data[1], data[2]];
    })()`) as number[];
    await page.emulateMedia({ colorScheme: 'light' });
    // Dark palette background #1f2226 (core/charts/style.ts): every channel well below mid-grey.
    expect(Math.max(...pixel)).toBeLessThan(80);
  });

  it('stackup editor: Save stays off without an edit, a unit switch converts every input, and one edit changes only that value', async () => {
    const data = (await served.workbench.api.getProject()).data;
    const rowsBefore = storedRows('stackup_layer', 'position');
    // The overview's Z0 column, to compare with the editor's (issue: the editor shows the same Z0 as the overview).
    await goTo(page, '#/overview');
    const overviewZ0 = await page.locator('[data-testid="routing-layers"] [data-testid="layer-z0"]').allTextContents();
    await goTo(page, '#/stackup');
    await page.getByTestId('stackup-table').waitFor();
    const save = page.getByTestId('save-stackup');
    expect(await save.isDisabled()).toBe(true); // nothing edited: nothing to save
    await expect.poll(() => page.locator('[data-testid="layer-properties"] [data-testid="z0"]').allTextContents()).toEqual(overviewZ0);

    const unit = page.getByLabel('Length unit');
    await unit.selectOption('mm');
    // Six significant digits of the stored value in mm (renderer/src/lib/exact-field.ts unitText).
    const mm = (m: number) => `${Number((m / 1e-3).toPrecision(6))} mm`;
    await expect.poll(() => page.getByTestId('thickness-1').inputValue()).toBe(mm(data.stackup.layers[1].thickness));
    const thicknesses = await page.locator('[data-testid^="thickness-"]').evaluateAll((els) => els.map((e) => (e as unknown as { value: string }).value));
    expect(thicknesses.every((t) => t.endsWith(' mm'))).toBe(true); // issue: "Switching to mm leaves inputs in mil"
    expect(await save.isDisabled()).toBe(true); // a unit switch is not an edit
    await unit.selectOption('mil');
    expect(await save.isDisabled()).toBe(true);

    const dielectric = data.stackup.layers.findIndex((l) => l.kind === 'dielectric');
    const dk = page.getByTestId(`dk-${dielectric}`);
    const shown = await dk.inputValue();
    await dk.fill('3.87');
    expect(await save.isDisabled()).toBe(false);
    await dk.fill(shown); // typed back to what was shown: no edit
    expect(await save.isDisabled()).toBe(true);
    await dk.fill('3.87');
    const sent = count('updateStackup');
    await save.click();
    await expect.poll(() => count('updateStackup')).toBe(sent + 1);
    await expect.poll(async () => (await served.workbench.api.getProject()).data.stackup.layers[dielectric].dk).toBe(3.87);
    const rowsAfter = storedRows('stackup_layer', 'position');
    // Every stored row byte-for-byte as before, except the one Dk typed: exactly 3.87, no display rounding.
    expect(rowsAfter).toEqual(rowsBefore.map((row, i) => (i === dielectric ? { ...row, dk: 3.87 } : row)));
    await screens('stackup');
  });

  it('stackup editor solves the width for a target Z0 and the pair gap for a target Zdiff, and takes the width on request', async () => {
    await goTo(page, '#/stackup');
    const panel = page.getByTestId('layer-targets');
    await panel.waitFor();
    const layers = await page.getByTestId('target-layer').locator('option').allTextContents();
    expect(layers.length).toBeGreaterThan(0);
    await page.getByTestId('target-layer').selectOption(layers[0]);
    await page.getByTestId('target-z0').fill('50');
    // 90 Ω: a pair of 50 Ω traces reaches at most 2·Z0 = 100 Ω as the gap opens (docs/design.md §3:
    // Zdiff = 2·Zodd), so 100 Ω is out of reach; 90 Ω is inside.
    await page.getByTestId('target-zdiff').fill('90');
    await page.getByTestId('solve-target').click();
    await page.getByTestId('target-result').waitFor({ timeout: 60_000 });
    const ohmsIn = (text: string | null) => Number((text ?? '').replace(/[^\d.]/g, ''));
    // Inverse solved to 0.05 % of the target (core/stackup/layer-inverse.ts) and printed to 0.1 Ω.
    expect(Math.abs(ohmsIn(await page.getByTestId('target-result').locator('tr').first().locator('td').nth(1).textContent()) - 50)).toBeLessThanOrEqual(0.1);
    expect(Math.abs(ohmsIn(await page.getByTestId('target-zdiff-result').textContent()) - 90)).toBeLessThanOrEqual(0.1);
    const widthText = (await page.getByTestId('target-width').textContent())!.trim();
    await page.getByTestId('use-width').click();
    const index = (await served.workbench.api.getProject()).data.stackup.layers.findIndex((l) => l.name === layers[0]);
    // The width input now holds the solved width (six significant digits shown, the exact value kept).
    expect(Number.parseFloat(await page.getByTestId(`width-${index}`).inputValue())).toBeCloseTo(Number.parseFloat(widthText), 1);
    expect(await page.getByTestId('save-stackup').isDisabled()).toBe(false);
    await screens('stackup-targets');
    await page.getByRole('button', { name: 'Discard changes' }).click();
    expect(await page.getByTestId('save-stackup').isDisabled()).toBe(true);
  });

  it('parts editor: VIH below VIL is refused in the form, nothing sent; one edit changes only that value', async () => {
    await goTo(page, '#/parts');
    const save = page.getByTestId('save-part');
    await save.waitFor();
    expect(await save.isDisabled()).toBe(true);
    const data = (await served.workbench.api.getProject()).data;
    const part = data.parts.find((p) => p.receiver && p.name === data.parts.find((q) => q.receiver)!.name)!;
    await page.getByRole('button', { name: new RegExp(`^${part.name}`) }).click();
    const receiverBefore = storedRows('part_receiver', 'part_id');
    const driverBefore = storedRows('part_driver', 'part_id');
    const sent = count('upsertPart');
    const vih = page.getByTestId('receiver-vih');
    const shownVih = await vih.inputValue();
    await vih.fill(String(part.receiver!.vil - 0.1));
    await expect.poll(() => page.getByTestId('receiver-error-vih').textContent()).toMatch(/must be above VIL/);
    expect(await save.isDisabled()).toBe(true); // refused in the form, not only by the server
    await vih.fill(shownVih);
    expect(await save.isDisabled()).toBe(true);
    await page.getByTestId('receiver-cin').fill('1.23 pF');
    await save.click();
    await expect.poll(() => count('upsertPart')).toBe(sent + 1);
    await expect.poll(async () => (await served.workbench.api.getProject()).data.parts.find((p) => p.name === part.name)!.receiver!.cin)
      .toSatisfy((c: number) => Math.abs(c - 1.23e-12) < 1e-27); // "1.23 pF" parsed: 1.23 × 1e-12, float rounding only
    const receiverAfter = storedRows('part_receiver', 'part_id');
    // Only the cin column of that part's receiver row changed; every other row and column is as stored.
    const changed = receiverAfter.map((row, i) => Object.keys(row).filter((k) => row[k] !== receiverBefore[i][k]));
    expect(changed.flat()).toEqual(['cin']);
    expect(storedRows('part_driver', 'part_id')).toEqual(driverBefore);
    await screens('parts');
  });

  it('net element editor: Apply only for a changed value, unit switch converts, the typed value is stored exactly', async () => {
    await goTo(page, `#/net/${encodeURIComponent(net)}`);
    await page.getByTestId('element-editor').waitFor();
    const before = storedRows('net_element', 'net_id, position');
    const stored = (await served.workbench.api.getProject()).data.nets.find((n) => n.name === net)!;
    const segment = stored.elements.findIndex((e) => e.kind === 'segment');
    const input = page.getByTestId(`element-${segment}`);
    const apply = page.getByTestId(`apply-${segment}`);
    expect(await apply.isDisabled()).toBe(true);
    await page.getByLabel('Length unit').selectOption('mm');
    const el = stored.elements[segment] as { length: number };
    await expect.poll(() => input.inputValue()).toBe(`${Number((el.length / 1e-3).toPrecision(6))} mm`);
    expect(await apply.isDisabled()).toBe(true);
    const typedMm = Number((el.length / 1e-3 + 1.5).toFixed(3));
    // The solve the parts edit started in the background ends first: this edit is then compared with it.
    await expect.poll(() => page.getByTestId('freshness').textContent(), { timeout: 120_000 }).toMatch(/^Results of/);
    boardBeforeEdit = await served.workbench.api.getResults();
    expect(boardBeforeEdit).not.toBeNull();
    await input.fill(String(typedMm)); // a bare number in the unit shown (mm)
    await apply.click();
    await page.getByTestId('update-time').waitFor({ timeout: 60_000 });
    const ms = await page.getByTestId('update-time').getAttribute('data-ms');
    console.log(`edit -> updated margins and waveform in the page: ${ms} ms (net ${net}, demo project)`);
    await page.getByLabel('Length unit').selectOption('mil');
    const after = storedRows('net_element', 'net_id, position');
    const changed = after.flatMap((row, i) => Object.keys(row).filter((k) => row[k] !== before[i][k]).map((k) => `${i}.${k}`));
    expect(changed).toHaveLength(1); // only that segment's length
    const storedLength = (await served.workbench.api.getProject()).data.nets.find((n) => n.name === net)!.elements[segment] as { length: number };
    expect(Math.abs(storedLength.length - typedMm * 1e-3)).toBeLessThan(1e-18); // mm × 1e-3: float rounding only
  });

  it('after an edit the board keeps showing results, marked outdated, and is solved again in the background', async () => {
    // The edit just made: the bar never says "Not solved yet"; a background solve brings fresh results unasked.
    const solves = count('startSolve');
    expect(solves).toBeGreaterThan(0);
    await expect.poll(() => page.getByTestId('freshness').textContent(), { timeout: 120_000 }).toMatch(/^Results of/);
    const bus = (await served.workbench.api.getProject()).data.nets.find((n) => n.name === net)!.bus;

    // Compared with the solve before the edit: the edited net's worst margin moved by exactly the difference.
    const worstOf = (b: typeof boardBeforeEdit) => {
      const r = b!.buses.flatMap((x) => x.nets).find((n) => n.net === net)!;
      return Math.min(r.setupMargin as number, r.holdMargin as number);
    };
    const after = (await served.workbench.api.getResults())!;
    await goTo(page, `#/bus/${encodeURIComponent(bus)}`);
    await page.getByTestId('margin-table').waitFor();
    const expected = marginText(worstOf(after) - worstOf(boardBeforeEdit)).replace(/ ps$/, '');
    await expect.poll(() => page.locator(`tr[data-net="${net}"] [data-testid="delta-margin"]`).textContent()).toBe(expected);
    expect(await page.locator('th:has([data-testid="sort-delta"])').getAttribute('title')).toMatch(/previous solve/);
    await screens('bus-delta');
    await goTo(page, '#/overview');

    // An edit the page did not make (another window, the CLI): after a reload the latest results stay
    // on screen, marked outdated with the nets affected, and the edited net's own page is solved fresh.
    const stored = (await served.workbench.api.getProject()).data.nets.find((n) => n.name === net)!;
    const segment = stored.elements.findIndex((e) => e.kind === 'segment');
    const el = stored.elements[segment] as { length: number };
    await served.workbench.api.updateNetElement(net, segment, { ...stored.elements[segment], length: el.length * 1.05 } as typeof stored.elements[number]);
    await goTo(page, '#/overview'); // reloaded on the net's own page, that net would be solved fresh at once
    await page.reload();
    await page.getByTestId('bus-table').or(page.getByTestId('margin-table')).or(page.getByTestId('net-margins')).first().waitFor();
    await goTo(page, '#/overview');
    await expect.poll(() => page.getByTestId('freshness').textContent()).toMatch(/^Inputs changed since the solve of .+: results are out of date$/);
    await expect.poll(() => page.getByTestId('changes').textContent()).toMatch(/^\d+ nets? affected/);
    expect(await page.getByTestId('last-solved').textContent()).not.toMatch(/none yet|never/);
    expect(await page.locator('[data-testid="bus-table"] [data-testid="status"]').allTextContents()).not.toContain('not solved');
    await screens('overview-outdated');
    await goTo(page, `#/bus/${encodeURIComponent(bus)}`);
    await page.getByTestId('bus-outdated').waitFor();
    expect(await page.locator('[data-testid="margin-table"] tbody tr[data-net]').count()).toBeGreaterThan(0);
    await expect.poll(() => page.locator(`[data-testid="margin-table"] tr[data-net="${net}"] .outdated-tag`).count()).toBe(1);
    await screens('bus-outdated');
    // Deep link into the edited net while the board is outdated: its own fresh re-solve is shown and stays.
    await page.goto(`${served.shell.url.split('#')[0]}#/net/${encodeURIComponent(net)}`);
    await page.getByTestId('net-margins').waitFor();
    const fresh = await served.workbench.api.solveNet(net);
    await expect.poll(() => page.getByTestId('net-setup').textContent()).toBe(marginText(fresh.setupMargin!));
    await page.waitForTimeout(500); // long enough for the page's own results request to have answered
    expect(await page.getByTestId('net-setup').textContent()).toBe(marginText(fresh.setupMargin!));
    expect(await page.getByTestId('net-outdated').count()).toBe(0);
  });

  it('corner and bus-timing editors offer Save only after an edit, and fit both window sizes', async () => {
    await goTo(page, '#/corners');
    await page.getByTestId('corners-table').waitFor();
    expect(await page.getByTestId('save-corners').isDisabled()).toBe(true);
    const edge = page.getByTestId('corner-0-edgeRate');
    const shown = await edge.inputValue();
    await edge.fill('1.31');
    expect(await page.getByTestId('save-corners').isDisabled()).toBe(false);
    await edge.fill(shown);
    expect(await page.getByTestId('save-corners').isDisabled()).toBe(true); // typed back: no change
    await screens('corners');
    const bus = (await served.workbench.api.getProject()).data.buses[0].name;
    await goTo(page, `#/bus/${encodeURIComponent(bus)}`);
    await page.getByTestId('edit-bus-timing').click();
    await page.getByTestId('bus-timing').waitFor();
    expect(await page.getByTestId('save-bus-timing').isDisabled()).toBe(true);
    // The formula cites the repository's own documentation, which exists.
    const cited = /docs\/workbench\.md/.test((await page.getByTestId('bus-timing').textContent()) ?? '');
    expect(cited && (await import('node:fs')).existsSync(join(root, 'docs', 'workbench.md'))).toBe(true);
    await screens('bus-timing');
  });

  it('ran every screen without a console error, CSP violation or failed request', () => {
    // The one exception: the browser's own icon fetch, cut off (ERR_ABORTED) when the test itself
    // navigates away while the page loads — a browser event, not the workbench's.
    const abortedIcon = (p: string) => /^request failed: \S+\/favicon\.svg \(net::ERR_ABORTED\)$/.test(p);
    expect(bench!.problems.filter((p) => !abortedIcon(p))).toEqual([]);
  });
});

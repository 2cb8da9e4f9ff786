/**
 * The net view's what-if sweep (docs/workbench.md, "What-if sweep"; docs/design.md §6.5): a length
 * sweep of the demo's DQ12 over 20 mm..120 mm draws the chart, its values are the services' own sweep
 * (the same API every host serves), the engine's length window is stated, a bad range is refused with
 * the field marked, and no console error, failed request or CSP violation occurs. Screenshots light
 * and dark at 1440x900 and 1024x768 (test-output only). Behaviour and consistency, no numeric source needed.
 */
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import type { Page } from 'playwright-core';
import type { ServedProject } from '../../main/web/serve-project.js';
import type { NetSweep } from '../../core/contract/api.js';
import type { NetElement } from '../../core/project/model.js';
import { join } from 'node:path';
import { goTo, shot, shots, startWorkbench, stopWorkbench, type Workbench } from './harness.js';

let bench: Workbench | undefined;
let served: ServedProject;
let page: Page;
/** DQ12's swept segment as stored before any sweep. */
let before: NetElement;

beforeAll(async () => {
  bench = await startWorkbench();
  ({ served, page } = bench);
}, 180_000);
afterAll(async () => {
  await stopWorkbench(bench);
});

describe('what-if sweep in the net view', { timeout: 180_000 }, () => {
  it('sweeps the length of DQ12\'s longest segment and draws the margins', async () => {
    await page.setViewportSize({ width: 1440, height: 900 });
    await page.goto(served.shell.url);
    before = (await served.workbench.api.getProject()).data.nets.find((n) => n.name === 'DQ12')!.elements[2];
    const now = before.kind === 'segment' ? before.length : NaN;
    await page.getByLabel('Length unit').selectOption('mm');
    await goTo(page, '#/net/DQ12');
    const panel = page.getByTestId('what-if');
    await panel.waitFor({ state: 'visible' });
    // the longest segment is offered first (segment 3 on L3_SIG)
    await expect.poll(() => page.getByTestId('sweep-quantity').inputValue()).toBe('length:2');
    await page.getByTestId('sweep-start').fill('20');
    await page.getByTestId('sweep-stop').fill('120');
    await page.getByTestId('sweep-points').fill('11');
    await page.getByTestId('sweep-run').click();
    const chart = page.getByTestId('sweep-chart');
    await chart.waitFor({ state: 'visible', timeout: 120_000 });
    // the canvas is painted
    const painted = await page.evaluate(`(() => {
      const c = document.querySelector('[data-testid="sweep-chart"] canvas');
      const d = c.getContext('2d').getImageData(c.width / 2, c.height / 2, 1, 1).data;
      return c.width > 0 && d[3] > 0;
    })()`);
    expect(painted).toBe(true);
    // nothing was edited since the sweep was asked for: it is not marked outdated
    expect(await page.getByTestId('sweep-outdated').count()).toBe(0);

    // the table behind the chart holds the services' sweep, value for value (consistency)
    const rows = await page.evaluate(`[...document.querySelectorAll('[data-testid="sweep-table"] tbody tr')].map((r) =>
      [Number(r.dataset.value), r.dataset.setup === '' ? null : Number(r.dataset.setup), r.dataset.hold === '' ? null : Number(r.dataset.hold)])`) as [number, number | null, number | null][];
    const direct: NetSweep = await served.workbench.api.sweepNet('DQ12', { quantity: { kind: 'length', elementIndex: 2 }, start: 0.02, stop: 0.12, points: 11 });
    expect(rows).toEqual(direct.points.map((p) => [p.value, p.setupMargin, p.holdMargin]));
    expect(rows).toHaveLength(11);
    // the engine's length window is stated, and it agrees with the net's own window (docs/design.md §6.3)
    const net = await served.workbench.api.solveNet('DQ12');
    const w = net.lengthWindow!;
    await expect.poll(() => page.getByTestId('sweep-window').textContent()).toContain(`${(w.min! * 1e3).toFixed(2)} mm to ${(w.max! * 1e3).toFixed(2)} mm`);
    await expect.poll(() => page.getByTestId('sweep-current').textContent()).toContain(`${(now * 1e3).toFixed(2)} mm`);

    for (const scheme of ['light', 'dark'] as const) {
      await page.emulateMedia({ colorScheme: scheme });
      for (const [width, height] of [[1440, 900], [1024, 768]] as const) {
        await page.setViewportSize({ width, height });
        await chart.scrollIntoViewIfNeeded();
        await page.waitForTimeout(150); // the chart resizes on the next frame
        await shot(page, `what-if-${scheme}-${width}`);
        await page.getByTestId('what-if').screenshot({ path: join(shots, `what-if-panel-${scheme}-${width}.png`) });
      }
    }
    await page.emulateMedia({ colorScheme: 'light' });
    await page.setViewportSize({ width: 1440, height: 900 });
    expect(bench!.problems).toEqual([]);
  });

  it('shows the tooltip of a value on the canvas without a style-policy violation', async () => {
    const chart = page.getByTestId('sweep-chart').locator('canvas').first();
    const box = (await chart.boundingBox())!;
    await page.mouse.move(box.x + box.width * 0.5, box.y + box.height * 0.55);
    await page.waitForTimeout(200);
    await page.getByTestId('what-if').screenshot({ path: join(shots, 'what-if-tooltip-light-1440.png') });
    expect(bench!.problems).toEqual([]);
  });

  it('refuses a range beyond the sane lengths with the field marked', async () => {
    await page.getByTestId('sweep-stop').fill('5000');
    await page.getByTestId('sweep-run').click();
    const error = page.getByTestId('sweep-error');
    await error.waitFor({ state: 'visible' });
    expect(await error.textContent()).toMatch(/sweep stop: must lie from/);
    expect(await page.getByTestId('sweep-stop').getAttribute('aria-invalid')).toBe('true');
    // the stored project is untouched: DQ12's segment keeps its length
    const { data } = await served.workbench.api.getProject();
    expect(data.nets.find((n) => n.name === 'DQ12')!.elements[2]).toEqual(before);
    // Chromium logs every HTTP 400 answer to the console; the provoked refusal is the only one expected.
    const expected = (p: string) => /^console: Failed to load resource: the server responded with a status of 400/.test(p);
    expect(bench!.problems.filter(expected)).toHaveLength(1);
    expect(bench!.problems.filter((p) => !expected(p))).toEqual([]);
  });

  it('bands the values of a termination sweep that fail on signal quality (demo A0, its end resistor)', async () => {
    await goTo(page, '#/net/A0');
    await page.getByTestId('what-if').waitFor({ state: 'visible' });
    await page.getByTestId('sweep-quantity').selectOption('resistance:16');
    await page.getByTestId('sweep-start').fill('10');
    await page.getByTestId('sweep-stop').fill('200');
    await page.getByTestId('sweep-points').fill('11');
    await page.getByTestId('sweep-run').click();
    const quality = page.getByTestId('sweep-quality');
    await quality.waitFor({ state: 'visible', timeout: 120_000 });
    // the values the services say fail on signal quality are the ones listed under the chart (consistency)
    const direct = await served.workbench.api.sweepNet('A0', { quantity: { kind: 'resistance', elementIndex: 16 }, start: 10, stop: 200, points: 11 });
    const failing = direct.points.filter((p) => !p.crosses || p.failingChecks.length > 0);
    expect(failing.length).toBeGreaterThan(0);
    expect(failing.length).toBeLessThan(11); // values near the present 39 Ω pass
    expect(await quality.textContent()).toContain(`fails at ${failing.length} of 11 values`);
    expect(await quality.textContent()).toContain(failing.map((p) => `${p.value.toFixed(1)} Ω`).join(', '));
    for (const scheme of ['light', 'dark'] as const) {
      await page.emulateMedia({ colorScheme: scheme });
      await page.getByTestId('sweep-chart').scrollIntoViewIfNeeded();
      await page.waitForTimeout(150);
      await page.getByTestId('what-if').screenshot({ path: join(shots, `what-if-termination-${scheme}-1440.png`) });
    }
    await page.emulateMedia({ colorScheme: 'light' });
    const expected = (p: string) => /^console: Failed to load resource: the server responded with a status of 400/.test(p);
    expect(bench!.problems.filter((p) => !expected(p))).toEqual([]);
  });
});

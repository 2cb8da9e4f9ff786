/**
 * End-to-end at board scale (docs/workbench.md, "Board scale"): a generated board of about 2,000 nets
 * (bench/generate-board.ts on the demo's linear models), solved through the services before the page
 * opens, with the local bus of every slice put into one bus of several hundred nets. The overview's
 * bus table comes from the board summary; the margin table of the big bus keeps only the rows in view
 * in the DOM while it is scrolled to the end and sorted, the keyboard still reaches the last row, and a
 * net opens from it. Zero console errors. Screenshots (light and dark) in test-output/screenshots.
 * Bounds on DOM rows: the window of renderer/src/lib/row-window.ts (rows in a 60 vh box plus 8 either
 * side), far below the bus's row count; no timing is asserted (speed belongs to npm run bench).
 */
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { join } from 'node:path';
import type { Page } from 'playwright-core';
import { generateBoard } from '../../bench/generate-board.js';
import { createProject, openProjectServices } from '../../main/services/compose.js';
import type { ProjectData } from '../../core/project/model.js';
import * as harness from './harness.js';
import type { Workbench } from './harness.js';

const NETS = 2000;
const BIG = 'LOCAL';

/** The generated board with every slice's local-bus data nets moved into the first local bus (their own clocks dropped). */
function bigBusBoard(): ProjectData {
  const board = generateBoard(NETS);
  const merged = new Set(board.buses.filter((b) => b.name.startsWith(`${BIG}_S`)).map((b) => b.name));
  const clocks = new Set(board.buses.filter((b) => merged.has(b.name)).map((b) => b.referenceNet));
  return {
    ...board,
    buses: board.buses.filter((b) => !merged.has(b.name)),
    nets: board.nets.filter((n) => !clocks.has(n.name)).map((n) => (merged.has(n.bus) ? { ...n, bus: BIG } : n)),
  };
}

let bench: Workbench | undefined;
let page: Page;
let problems: string[] = [];
let bigBusNets = 0;
let totalNets = 0;

beforeAll(async () => {
  bench = await harness.startWorkbench({
    project: async (dir) => {
      const { mkdirSync } = await import('node:fs');
      mkdirSync(dir, { recursive: true });
      const path = join(dir, 'board.slackline');
      const data = bigBusBoard();
      totalNets = data.nets.length;
      bigBusNets = data.nets.filter((n) => n.bus === BIG).length;
      createProject(path, data, { author: 'tester' });
      // Solved before the page opens (the worker pool, the shell's own solve options, so the results are
      // fresh there), so the test exercises the screens, not the solver.
      const services = openProjectServices(path);
      try {
        await services.solver.solveBoard({});
      } finally {
        await services.close();
      }
      return path;
    },
  });
  ({ page, problems } = bench);
}, 240_000);

afterAll(async () => {
  await harness.stopWorkbench(bench);
});

/** Rows of the margin table in the DOM (spacers not counted). */
async function domRows(): Promise<number> {
  return page.locator('[data-testid="margin-table"] tbody tr[data-net]').count();
}

/** Most rows the window may render: rows fitting the scroll box plus 8 either side (row-window.ts). */
async function rowBound(): Promise<number> {
  const box = await page.getByTestId('margin-scroll').boundingBox();
  const row = await page.locator('[data-testid="margin-table"] tbody tr[data-net]').first().boundingBox();
  return Math.ceil((box?.height ?? 0) / (row?.height ?? 1)) + 1 + 2 * 8;
}

describe.sequential('the workbench on a board of thousands of nets', { timeout: 240_000 }, () => {
  it('opens the overview with every bus from the board summary', async () => {
    expect(totalNets).toBeGreaterThan(1900); // 2,000 less the merged slices' clock nets
    expect(bigBusNets).toBeGreaterThan(300);
    const opened = Date.now();
    await page.goto(bench!.served.shell.url);
    await page.getByTestId('bus-table').locator(`[data-testid="open-bus-${BIG}"]`).waitFor();
    // Printed, not asserted (docs/workbench.md, "Board scale"; the bench measures it).
    console.log(`scale e2e: overview's bus table of ${totalNets} nets shown ${Date.now() - opened} ms after navigation`);
    const buses = await page.getByTestId('bus-table').locator('tbody button.link[data-testid^="open-bus-"]').count();
    const { data } = await bench!.served.workbench.api.getProject();
    expect(buses).toBe(data.buses.length);
    await expect.poll(async () => page.getByTestId('freshness').textContent(), { timeout: 30_000 }).toMatch(/^Results of/);
    await harness.shot(page, 'scale-overview');
  });

  it('shows the big bus with only the rows in view in the DOM, also scrolled to the end', async () => {
    await harness.goTo(page, `#/bus/${BIG}`);
    await page.locator('[data-testid="margin-table"] tbody tr[data-net]').first().waitFor();
    await expect.poll(async () => page.getByTestId('filter-all').textContent(), { timeout: 30_000 }).toContain(String(bigBusNets));
    const bound = await rowBound();
    expect(bound).toBeLessThan(bigBusNets / 4); // the window is a small part of the bus
    expect(await domRows()).toBeLessThanOrEqual(bound);
    const scroller = page.getByTestId('margin-scroll');
    for (const fraction of [0.25, 0.5, 1]) {
      await scroller.evaluate((el, f) => { el.scrollTop = f * el.scrollHeight; }, fraction);
      await page.waitForTimeout(100); // one animation frame or more for the window to follow
      expect(await domRows()).toBeLessThanOrEqual(bound);
    }
    // Scrolled to the end, the last rows of the bus are there (the spacer below is gone).
    expect(await page.getByTestId('spacer-after').count()).toBe(0);
    expect(await page.getByTestId('spacer-before').count()).toBe(1);
    await harness.shot(page, 'scale-bus-scrolled');
  });

  it('sorts all rows of the bus, not only the rendered ones: by net name, the first row is the smallest name of the bus', async () => {
    const scroller = page.getByTestId('margin-scroll');
    await page.getByTestId('sort-net').click();
    await page.waitForTimeout(100);
    // a new sort starts at the top
    expect(await scroller.evaluate((el) => el.scrollTop)).toBe(0);
    const first = await page.locator('[data-testid="margin-table"] tbody tr[data-net]').first().getAttribute('data-net');
    const { data } = await bench!.served.workbench.api.getProject();
    const names = data.nets.filter((n) => n.bus === BIG).map((n) => n.name);
    // natural order, as the table sorts (renderer/src/lib/margin-table.ts: numeric collation)
    names.sort(new Intl.Collator(undefined, { numeric: true, sensitivity: 'base' }).compare);
    expect(first).toBe(names[0]);
    await page.getByTestId('sort-net').click(); // reversed: the largest name first
    await page.waitForTimeout(100);
    expect(await page.locator('[data-testid="margin-table"] tbody tr[data-net]').first().getAttribute('data-net')).toBe(names[names.length - 1]);
    expect(await domRows()).toBeLessThanOrEqual(await rowBound());
    // The table's size for assistive technology is the whole bus (header row + every net).
    expect(await page.getByTestId('margin-table').getAttribute('aria-rowcount')).toBe(String(bigBusNets + 1));
  });

  it('reaches the last row from the keyboard (End), scrolled into view, and opens it with Enter', async () => {
    const body = page.locator('[data-testid="margin-table"] tbody');
    await body.focus();
    await page.keyboard.press('Home');
    await page.keyboard.press('End');
    const { data } = await bench!.served.workbench.api.getProject();
    const names = data.nets.filter((n) => n.bus === BIG).map((n) => n.name)
      .sort(new Intl.Collator(undefined, { numeric: true, sensitivity: 'base' }).compare);
    const last = names[0]; // reversed sort: the last row holds the smallest name
    const selected = page.locator('[data-testid="margin-table"] tbody tr.selected');
    await expect.poll(async () => selected.getAttribute('data-net'), { timeout: 10_000 }).toBe(last);
    expect(await selected.getAttribute('aria-rowindex')).toBe(String(bigBusNets + 1));
    const inView = await selected.evaluate((row) => {
      const box = row.closest('[data-testid="margin-scroll"]')!.getBoundingClientRect();
      const r = row.getBoundingClientRect();
      return r.top >= box.top && r.bottom <= box.bottom + 1;
    });
    expect(inView).toBe(true);
    expect(await domRows()).toBeLessThanOrEqual(await rowBound());
    await harness.shot(page, 'scale-bus-end');
    await page.keyboard.press('Enter');
    await page.locator('#net-title').waitFor();
    await expect.poll(async () => page.locator('#net-title').textContent(), { timeout: 30_000 }).toContain(last);
    await page.getByTestId('net-margins').waitFor({ timeout: 60_000 });
    await harness.shot(page, 'scale-net');
  });

  it('looks the same in dark mode (screenshots) and saw no console error, page error or failed request', async () => {
    await page.emulateMedia({ colorScheme: 'dark' });
    await harness.goTo(page, `#/bus/${BIG}`);
    await page.locator('[data-testid="margin-table"] tbody tr[data-net]').first().waitFor();
    await page.getByTestId('margin-scroll').evaluate((el) => { el.scrollTop = el.scrollHeight / 2; });
    await page.waitForTimeout(150);
    await harness.shot(page, 'scale-bus-dark');
    await page.emulateMedia({ colorScheme: 'light' });
    expect(problems).toEqual([]);
  });
});

/**
 * The stackup view draws the field solution of a chosen routing layer (docs/field-solver.md): the
 * picture appears for the layer picked, is drawn from the same service answer the API gives (grid and
 * potential between 0 V and the driven trace), and no console error or failed request occurs.
 * Behaviour, no numeric source needed.
 */
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import type { Page } from 'playwright-core';
import type { ServedProject } from '../../main/web/serve-project.js';
import { goTo, shot, startWorkbench, stopWorkbench, type Workbench } from './harness.js';

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

describe('field picture in the stackup view', { timeout: 120_000 }, () => {
  it('draws the potential over the chosen layer', async () => {
    await page.goto(served.shell.url);
    await goTo(page, '#/stackup');
    await page.getByTestId('field-layer').selectOption('L1_TOP');
    const picture = page.getByTestId('field-picture');
    await picture.waitFor({ state: 'visible' });
    await expect.poll(() => picture.getAttribute('aria-label')).toBe('Potential over the cross-section of L1_TOP');
    // the canvas is painted: some pixel in the middle of the plot is not blank
    const painted = await page.evaluate(`(() => {
      const c = document.querySelector('[data-testid="field-picture"]');
      const d = c.getContext('2d').getImageData(c.width / 2, c.height / 3, 1, 1).data;
      return d[3] > 0;
    })()`);
    expect(painted).toBe(true);
    const { data } = await served.workbench.api.getProject();
    const layer = data.stackup.layers.find((l) => l.name === 'L1_TOP')!;
    const map = await served.workbench.api.layerFieldMap(data.stackup, 'L1_TOP', layer.defaultWidth!);
    expect(map.potential.length).toBe(map.nx * map.ny);
    expect(Math.min(...map.potential)).toBeGreaterThanOrEqual(-1e-9);
    await shot(page, 'field-picture-1440');
    expect(bench!.problems).toEqual([]);
  });
});

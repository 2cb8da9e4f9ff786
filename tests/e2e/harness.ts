/**
 * Shared start-up of the end-to-end suites: builds the renderer into a temp folder, serves a fresh
 * copy of the demo project through the loopback HTTP shell (real services: database, solver,
 * budgets), and opens Debian's Chromium (playwright-core) on it. Console errors, page errors, failed
 * requests and CSP violations are collected in `problems` for each suite's last check.
 */
import { expect } from 'vitest';
import { mkdirSync, mkdtempSync, rmSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join, resolve } from 'node:path';
import { build } from 'vite';
import { chromium, type Browser, type Page } from 'playwright-core';
import { createDemoProject } from '../../main/services/project/demo.js';
import { serveProject, type ServedProject } from '../../main/web/serve-project.js';

export const root = resolve(__dirname, '..', '..');
export const shots = join(root, 'test-output', 'screenshots');

export interface Workbench {
  /** Temp folder holding the built renderer and the project; removed by stopWorkbench. */
  work: string;
  served: ServedProject;
  browser: Browser;
  page: Page;
  /** Console errors, page errors, failed requests and CSP violations seen so far. */
  problems: string[];
}

/**
 * `readOnly`: the shell opens the demo project read-only (its --read-only; docs/workbench.md, "Read-only projects").
 * `project`: makes the project to serve in the given folder and returns its path (default: the demo project).
 */
export async function startWorkbench(options: { readOnly?: boolean; project?: (dir: string) => string | Promise<string> } = {}): Promise<Workbench> {
  const work = mkdtempSync(join(tmpdir(), 'slackline-e2e-'));
  mkdirSync(shots, { recursive: true });
  const rendererDir = join(work, 'renderer');
  // Built into the temp folder so a developer's out/renderer is left alone.
  await build({ configFile: join(root, 'renderer', 'vite.config.ts'), logLevel: 'error', build: { outDir: rendererDir, emptyOutDir: true } });
  const projectPath = options.project ? await options.project(join(work, 'project')) : createDemoProject(join(work, 'project'));
  const served = await serveProject({ projectPath, rendererDir, readOnly: options.readOnly });
  const browser = await chromium.launch({
    executablePath: '/usr/bin/chromium',
    args: ['--headless', '--no-sandbox', '--disable-gpu', '--disable-background-networking', '--disable-component-update', '--no-first-run'],
  });
  const context = await browser.newContext({ viewport: { width: 1440, height: 960 }, colorScheme: 'light', acceptDownloads: true });
  const page = await context.newPage();
  const problems: string[] = [];
  page.on('console', (message) => {
    if (message.type() === 'error') problems.push(`console: ${message.text()}`);
  });
  page.on('pageerror', (error) => problems.push(`page error: ${error.message}`));
  page.on('requestfailed', (request) => {
    const reason = request.failure()?.errorText ?? 'no reason given';
    // A read (an api/get* call: a job poll, a bus's results) or the page icon still in flight when a
    // test reloads or navigates is cancelled by the browser (net::ERR_ABORTED): that is the page going
    // away, not a failure of the app. An aborted write still counts.
    if (reason === 'net::ERR_ABORTED' && /^\/(api\/get[A-Za-z]+|favicon\.svg)$/.test(new URL(request.url()).pathname)) return;
    problems.push(`request failed: ${request.url()} (${reason})`);
  });
  // Page-side code is passed as text: this file compiles without DOM types.
  await page.addInitScript(`document.addEventListener('securitypolicyviolation', (event) => {
    console.error('CSP violation: ' + event.violatedDirective + ' ' + event.blockedURI);
  });`);
  return { work, served, browser, page, problems };
}

export async function stopWorkbench(bench: Partial<Workbench> | undefined): Promise<void> {
  await bench?.browser?.close();
  await bench?.served?.close();
  if (bench?.work) rmSync(bench.work, { recursive: true, force: true });
}

/** Full-page screenshot to test-output/screenshots/NAME.png. */
export async function shot(page: Page, name: string): Promise<void> {
  await page.evaluate('window.scrollTo(0, 0)'); // sticky bars land in place on a full-page capture
  await page.screenshot({ path: join(shots, `${name}.png`), fullPage: true });
}

/** Moves the single-page app to a place, as the browser's address bar would. */
export async function goTo(page: Page, hash: string): Promise<void> {
  await page.evaluate(`window.location.hash = ${JSON.stringify(hash)}`);
}

/** Margin text such as "−35 ps" or "+120 ps" to seconds; a bare number (table cells, unit in the header) is in ps. */
export function marginOf(text: string): number {
  const match = /^([−+-]?)(\d+(?:\.\d+)?)(?:\s*ps)?(?:\s|$)/.exec(text.trim());
  if (!match) throw new Error(`not a margin: "${text}"`);
  return (match[1] === '−' || match[1] === '-' ? -1 : 1) * Number(match[2]) * 1e-12;
}

/** Presses "Solve all buses" and waits until the bar reports fresh results. */
export async function solveAll(page: Page, progressShot?: string): Promise<void> {
  await page.getByTestId('solve-board').click();
  if (progressShot) await shot(page, progressShot); // whatever the bar shows at that moment, for people to look at
  try {
    await expect.poll(async () => page.getByTestId('freshness').textContent(), { timeout: 120_000, interval: 250 }).toMatch(/^Results of/);
  } catch (error) {
    // Say what the page showed instead: a failed solve's message, or where progress stopped.
    const alerts = await page.locator('[role="alert"]').allTextContents().catch(() => []);
    const progress = await page.getByTestId('solve-progress').textContent({ timeout: 1000 }).catch(() => null);
    (error as Error).message += `\npage alerts: ${JSON.stringify(alerts)}; solve progress: ${progress ?? 'none shown'}`;
    throw error;
  }
}

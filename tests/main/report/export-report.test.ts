import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { execFileSync } from 'node:child_process';
import { mkdtempSync, readFileSync, readdirSync, rmSync, existsSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { parse } from 'csv-parse/sync';
import { exportReport } from '../../../main/services/report/export.js';
import { formatMarginPs, psCell } from '../../../core/report/format.js';
import { InputError } from '../../../core/errors.js';
import type { BoardResult } from '../../../core/budget/results.js';
import type { ProjectData } from '../../../core/project/model.js';
import { loadProject, loadResult, wideBus } from '../../core/report/fixture.js';
import { latticeNetWaveforms } from './lattice-waveforms.js';

// Renders with Debian poppler-utils (pdftoppm, pdftotext), as docs/design.md §8.5 states.
const dirs: string[] = [];
function tempDir(): string {
  const dir = mkdtempSync(join(tmpdir(), 'slackline-report-'));
  dirs.push(dir);
  return dir;
}
afterAll(() => {
  for (const dir of dirs) rmSync(dir, { recursive: true, force: true });
});

const AT = new Date('2026-12-01T18:00:00Z');
const LIMITS = { vil: 0.5, vih: 0.7, vmaxAbs: 1.5, vminAbs: -0.3 };

function pdfText(path: string, page?: number): string {
  const args = ['-layout', ...(page ? ['-f', String(page), '-l', String(page)] : []), path, '-'];
  return execFileSync('pdftotext', args, { encoding: 'utf8' });
}

function pageCount(path: string): number {
  const info = execFileSync('pdfinfo', [path], { encoding: 'utf8' });
  return Number(/Pages:\s+(\d+)/.exec(info)![1]);
}

/** Rasterises every page at 60 dpi; returns the PNG count. */
function renderPages(path: string): number {
  const out = tempDir();
  execFileSync('pdftoppm', ['-png', '-r', '60', path, join(out, 'page')]);
  return readdirSync(out).filter((f) => f.endsWith('.png')).length;
}

describe('exportReport on the invented fixture board', () => {
  let files: string[];
  let project: ProjectData;
  let result: BoardResult;

  beforeAll(async () => {
    project = loadProject();
    result = loadResult();
    files = await exportReport(project, result, {
      outDir: tempDir(),
      formats: ['pdf', 'html', 'csv'],
      generatedAt: AT,
      waveforms: (net) =>
        latticeNetWaveforms(net.net, 'U5', { vdd: 1.2, rs: 18, z0: 50, td: 0.35e-9, ramp: 0.19e-9 }, ['slow', 'typical', 'fast'], LIMITS),
    });
  });

  it('writes the three files under the project and revision name', () => {
    expect(files.map((f) => f.split('/').pop())).toEqual([
      'heron-ridge-data-logger-b2-margin-report.pdf',
      'heron-ridge-data-logger-b2-margin-report.html',
      'heron-ridge-data-logger-b2-margins.csv',
    ]);
    for (const f of files) expect(existsSync(f)).toBe(true);
    // No temporary file is left beside them.
    expect(readdirSync(join(files[0], '..')).some((f) => f.includes('partial'))).toBe(false);
  });

  it('produces a PDF that poppler renders page by page', () => {
    const pages = pageCount(files[0]);
    expect(pages).toBeGreaterThanOrEqual(5);
    expect(renderPages(files[0])).toBe(pages);
  });

  it("prints each bus's worst margins as computed, in the report's format", () => {
    const text = pdfText(files[0]).replace(/\s+/g, ' ');
    for (const bus of result.buses.filter((b) => b.nets.length)) {
      expect(text).toContain(`Bus ${bus.bus}`);
      expect(text).toContain(`Worst setup margin ${formatMarginPs(bus.worstSetup)}`);
      expect(text).toContain(`Worst hold margin ${formatMarginPs(bus.worstHold)}`);
    }
    expect(text).toContain(`Worst setup margin -11.5 ps`); // LANE0: fixture value -11.496 ps
    expect(text).toContain('Bus SPARE has no nets');
  });

  it('numbers every page and keeps units on the chart axes', () => {
    const pages = pageCount(files[0]);
    for (let p = 1; p <= pages; p++) expect(pdfText(files[0], p)).toContain(`Page ${p} of ${pages}`);
    const text = pdfText(files[0]);
    expect(text).toContain('Time (ns)');
    expect(text).toContain('Voltage (V)');
    expect(text).toContain('Flight time (ps)');
    expect(text).toContain('Z0 (Ω)'); // DejaVu carries the Ω glyph
  });

  it('writes an HTML file that requests nothing from outside itself', () => {
    const html = readFileSync(files[1], 'utf8');
    expect(html).not.toMatch(/https?:/i);
    expect(html).not.toContain('//');
    expect(html).not.toMatch(/<script|<link|@import|url\((?!#)/i);
    for (const m of html.matchAll(/\b(?:src|href)\s*=\s*["']?([^"'\s>]*)/gi)) expect(m[1]).toMatch(/^(data:|#)/);
    expect((html.match(/<svg\b/g) ?? []).length).toBeGreaterThanOrEqual(5); // 2 skew + 3 waveform charts
    expect(html).toContain(`<td class="right">${psCell(result.buses[0].worstSetup)}</td>`);
  });

  it('writes a CSV that parses back to the same numbers', () => {
    const rows = parse(readFileSync(files[2], 'utf8'), { columns: true, cast: true }) as Record<string, string | number>[];
    const nets = result.buses.flatMap((b) => b.nets);
    expect(rows).toHaveLength(nets.length);
    nets.forEach((net, i) => {
      expect(rows[i].net).toBe(net.net);
      // Written rounded to 0.001 ps; the round trip may differ by half of that.
      expect(Math.abs(Number(rows[i].setup_margin_ps) - net.setupMargin! / 1e-12)).toBeLessThanOrEqual(0.0005);
      expect(Math.abs(Number(rows[i].hold_margin_ps) - net.holdMargin! / 1e-12)).toBeLessThanOrEqual(0.0005);
      expect(Math.abs(Number(rows[i].flight_max_ps) - net.flightMax! / 1e-12)).toBeLessThanOrEqual(0.0005);
    });
  });
});

describe('exportReport edge cases', () => {
  it('says so when the project has no buses, in every format', async () => {
    const project = { ...loadProject(), buses: [], nets: [] };
    const result = { ...loadResult(), buses: [] };
    const [pdf, html, csv] = await exportReport(project, result, { outDir: tempDir(), formats: ['pdf', 'html', 'csv'], generatedAt: AT });
    expect(pdfText(pdf).replace(/\s+/g, ' ')).toContain('This project has no buses');
    expect(readFileSync(html, 'utf8')).toContain('This project has no buses');
    expect(parse(readFileSync(csv, 'utf8'), { columns: true })).toEqual([]);
    expect(readFileSync(csv, 'utf8').split('\n')[0]).toContain('setup_margin_ps');
  });

  it('repeats the table header on every page a long margin table runs onto', async () => {
    const result = { ...loadResult(), buses: [wideBus(90)] };
    const [pdf] = await exportReport(loadProject(), result, { outDir: tempDir(), formats: ['pdf'], generatedAt: AT });
    const pages = pageCount(pdf);
    const continued = Array.from({ length: pages }, (_, i) => pdfText(pdf, i + 1)).filter((t) => t.includes('Margin table, WIDE') && t.includes('(continued)'));
    expect(continued.length).toBeGreaterThanOrEqual(1);
    // The header wraps inside its narrow cells ("Flight" over "min (ps)"): its first line is read.
    for (const page of continued) expect(page.replace(/\s+/g, ' ')).toMatch(/Net Role Flight Flight Skew/);
  });

  it('reports one bus with --bus and refuses an unknown one before writing anything', async () => {
    const dir = tempDir();
    const files = await exportReport(loadProject(), loadResult(), { outDir: dir, formats: ['csv'], bus: 'CMD', generatedAt: AT });
    expect(files[0]).toMatch(/heron-ridge-data-logger-b2-cmd-margins\.csv$/);
    const rows = parse(readFileSync(files[0], 'utf8'), { columns: true }) as { bus: string }[];
    expect(new Set(rows.map((r) => r.bus))).toEqual(new Set(['CMD']));
    const empty = tempDir();
    await expect(exportReport(loadProject(), loadResult(), { outDir: empty, formats: ['pdf'], bus: 'NOPE' })).rejects.toThrow(InputError);
    expect(readdirSync(empty)).toEqual([]);
  });

  it('refuses an unknown format by name', async () => {
    await expect(
      exportReport(loadProject(), loadResult(), { outDir: tempDir(), formats: ['pdf', 'docx' as 'pdf'] }),
    ).rejects.toThrow('formats: unknown report format "docx" (choose from pdf, html, csv)');
  });

  it('falls back to Helvetica without DejaVu and spells Ω out instead of printing garbage', async () => {
    const [pdf] = await exportReport(loadProject(), loadResult(), { outDir: tempDir(), formats: ['pdf'], fontDir: '/nonexistent-fonts', generatedAt: AT });
    expect(renderPages(pdf)).toBe(pageCount(pdf));
    const text = pdfText(pdf);
    expect(text).toContain('Z0 (ohm)');
    expect(text).not.toContain('Ω');
  });
});

/**
 * The written report (PDF, HTML, CSV) carries the waived-nets section, the margin table's worst-margin
 * and Δ-vs-previous columns with their definitions, and the previous solve's time (docs/workbench.md,
 * "Waivers" and "Margin table"). Invented fixture (fixtures/report/README.md) with invented waivers and
 * a hand-made previous solve; read back with Debian poppler-utils (pdftotext, pdftoppm) as
 * docs/design.md §8.5 states. Hand calculation: DQ2 worst now min(-11.496, 320.888) = -11.496 ps,
 * before -20 ps, delta +8.504 ps (printed +8.5).
 */
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { execFileSync } from 'node:child_process';
import { mkdirSync, mkdtempSync, readFileSync, readdirSync, rmSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { exportReport } from '../../../main/services/report/export.js';
import { COLUMN_DEFINITIONS } from '../../../core/report/columns.js';
import type { ProjectData } from '../../../core/project/model.js';
import { loadProject, loadResult } from '../../core/report/fixture.js';

const dir = mkdtempSync(join(tmpdir(), 'slackline-waiver-report-'));
afterAll(() => rmSync(dir, { recursive: true, force: true }));

const project: ProjectData = {
  ...loadProject(),
  waivers: [
    { net: 'DQ2', check: 'setup margin', status: 'fail', margin: -11.496e-12, unit: 's', comment: 'Lane trained at power-up (invented)', author: 'A. Reviewer', at: '2026-11-30T15:00:00.000Z' },
    { net: 'DQ3', check: 'overshoot', status: 'fail', margin: -0.05, unit: 'V', comment: 'Clamp diode limits it (invented)', author: 'B. Checker', at: '2026-11-30T15:10:00.000Z' },
  ],
};
const previous = { solvedAt: '2026-11-29T09:00:00.000Z', margins: { DQ2: -20e-12, DQ0: 90e-12 } };

/** Text of the PDF with runs of spaces folded (pdftotext -layout spaces words out to their columns). */
const pdfText = (path: string) => execFileSync('pdftotext', ['-layout', path, '-'], { encoding: 'utf8' }).replace(/[ \t]+/g, ' ');

describe('the written report with waivers and a previous solve', () => {
  let pdf = '';
  let html = '';
  let csv = '';

  beforeAll(async () => {
    [pdf, html, csv] = await exportReport(project, loadResult(), {
      outDir: dir, formats: ['pdf', 'html', 'csv'], generatedAt: new Date('2026-12-01T18:00:00Z'), previous,
    });
  });

  it('prints the waived-nets section in the PDF and the HTML', () => {
    for (const text of [pdfText(pdf), readFileSync(html, 'utf8')]) {
      expect(text).toContain('Waived nets (2)');
      expect(text).toContain('DQ2 (bus LANE0): FAIL · waived');
      expect(text).toContain('Lane trained at power-up (invented)');
      expect(text).toContain('A. Reviewer');
      expect(text).toContain('2026-11-30 15:00 UTC');
      expect(text).toMatch(/STALE, needs review: overshoot got worse/);
    }
  });

  it('prints the delta column, the previous solve\'s time and the column definitions under the margin table', () => {
    const text = pdfText(pdf);
    expect(text).toMatch(/Δ vs previous/);
    expect(text).toContain('+8.5');
    expect(text).toContain('compares with the whole-board solve of 2026-11-29 09:00 UTC');
    // A definition wraps over lines in the PDF: compare its first words.
    expect(text).toContain(COLUMN_DEFINITIONS.margin);
    expect(text).toContain(COLUMN_DEFINITIONS.delta.slice(0, 40));
    const page = readFileSync(html, 'utf8');
    expect(page).toContain(COLUMN_DEFINITIONS.delta);
    expect(page).toContain('A waived net shows'); // from the status definition (its quotes are escaped in HTML)
  });

  it('writes the same columns into the CSV', () => {
    const [header] = readFileSync(csv, 'utf8').split('\n');
    expect(header).toContain('worst_margin_ps,delta_vs_previous_ps');
    expect(header).toContain('waiver,waived_check,waived_status,waived_margin,waiver_author,waiver_at,waiver_comment,waiver_review');
  });

  it('renders every page (the waived-nets page among them) to PNG', () => {
    const out = join(dir, 'png');
    mkdirSync(out);
    execFileSync('pdftoppm', ['-png', '-r', '50', pdf, join(out, 'page')]);
    expect(readdirSync(out).filter((f) => f.endsWith('.png')).length).toBeGreaterThan(2);
  });
});

/**
 * The report's waived-nets section, its margin-table columns (worst margin, Δ vs previous solve) with
 * their definitions, and the CSV's matching columns (docs/workbench.md, "Waivers" and "Margin table"),
 * on the invented report fixture (fixtures/report/README.md) with invented waivers and a hand-made
 * previous solve. Expected numbers are hand calculations from the fixture's margins, shown beside them.
 */
import { describe, expect, it } from 'vitest';
import { buildReport } from '../../../core/report/build.js';
import { marginCsvRecords, type PreviousMargins } from '../../../core/report/csv.js';
import { COLUMN_DEFINITIONS, MARGIN_COLUMNS } from '../../../core/report/columns.js';
import { COLUMN_DEFINITIONS as WORKBENCH_DEFINITIONS } from '../../../renderer/src/lib/margin-table.js';
import type { ReportBlock, ReportDocument } from '../../../core/report/document.js';
import type { ProjectData } from '../../../core/project/model.js';
import { loadProject, loadResult } from './fixture.js';

const AT = '2026-12-01T18:00:00.000Z';
const PREVIOUS: PreviousMargins = {
  solvedAt: '2026-11-29T09:00:00.000Z',
  // Hand-made previous solve (s): DQ2 was -20 ps, DQ0 +90 ps; DQ1 had no number.
  margins: { DQ2: -20e-12, DQ0: 90e-12, DQ1: null },
};

function project(): ProjectData {
  return {
    ...loadProject(),
    waivers: [
      // DQ2 as it is in the fixture (setup -11.496 ps): current.
      { net: 'DQ2', check: 'setup margin', status: 'fail', margin: -11.496e-12, unit: 's', comment: 'Lane trained at power-up (invented)', author: 'A. Reviewer', at: '2026-11-30T15:00:00.000Z' },
      // DQ3 waived at 50 mV past the overshoot limit; the fixture has 1.62 - 1.50 = 120 mV past it: stale.
      { net: 'DQ3', check: 'overshoot', status: 'fail', margin: -0.05, unit: 'V', comment: 'Clamp diode limits it (invented)', author: 'B. Checker', at: '2026-11-30T15:10:00.000Z' },
    ],
  };
}

function build(over: Partial<Parameters<typeof buildReport>[0]> = {}): ReportDocument {
  return buildReport({ project: project(), result: loadResult(), layers: [], generatedAt: AT, previous: PREVIOUS, ...over });
}

const marginTable = (doc: ReportDocument) => doc.blocks.findIndex((b) => b.kind === 'table' && b.caption.startsWith('Margin table, LANE0'));
function tableAt(doc: ReportDocument, i: number) {
  const b = doc.blocks[i];
  if (b.kind !== 'table') throw new Error('not a table');
  return b.table;
}
const row = (doc: ReportDocument, net: string) => tableAt(doc, marginTable(doc)).rows.find((r) => r.cells[0] === net)!.cells;
const column = (doc: ReportDocument, title: string) => tableAt(doc, marginTable(doc)).columns.findIndex((c) => c.title === title);
const texts = (blocks: ReportBlock[]) => blocks.flatMap((b) => (b.kind === 'heading' || b.kind === 'paragraph' ? [b.text] : b.kind === 'facts' ? b.items.map((f) => `${f.label}: ${f.value}`) : []));

describe('report margin table: worst margin and Δ vs previous solve', () => {
  it('prints the worst margin and the delta against the previous solve per net', () => {
    const doc = build();
    const worst = column(doc, 'Worst margin (ps)');
    const delta = column(doc, 'Δ vs previous solve (ps)');
    expect(worst).toBeGreaterThan(0);
    expect(delta).toBe(worst + 1);
    // DQ2: worst now = min(-11.496, +320.888) = -11.496 ps; before -20 ps; Δ = -11.496 - (-20) = +8.504 -> "+8.5".
    expect(row(doc, 'DQ2')[worst]).toBe('-11.5');
    expect(row(doc, 'DQ2')[delta]).toBe('+8.5');
    // DQ0: worst now = min(+87.648, +230.584) = 87.648 ps; before 90 ps; Δ = -2.352 -> "-2.4".
    expect(row(doc, 'DQ0')[delta]).toBe('-2.4');
    // DQ1 had no previous number, DQS0 was not in the previous solve: empty.
    expect(row(doc, 'DQ1')[delta]).toBe('—');
    expect(row(doc, 'DQS0')[delta]).toBe('—');
  });

  it('says which previous solve, by time, under the table; and that there is none without one', () => {
    const doc = build();
    const after = texts(doc.blocks.slice(marginTable(doc) + 1, marginTable(doc) + 2));
    expect(after[0]).toBe('Δ vs previous solve compares with the whole-board solve of 2026-11-29 09:00 UTC (the one before these results of 2026-11-30 14:05 UTC).');
    const none = build({ previous: null });
    expect(texts(none.blocks.slice(marginTable(none) + 1, marginTable(none) + 2))[0]).toMatch(/^Δ vs previous solve is empty: no earlier whole-board solve/);
    expect(row(none, 'DQ2')[column(none, 'Δ vs previous solve (ps)')]).toBe('—');
  });

  it('prints one definition per column once, ahead of the bus sections, the same words as the workbench tooltips', () => {
    const doc = build();
    // Common practice, no source: a definition repeated under every bus's table is read once and skipped after.
    const headings = doc.blocks.flatMap((b, i) => (b.kind === 'heading' && b.text === 'Margin table columns' ? [i] : []));
    expect(headings).toHaveLength(1);
    expect(headings[0]).toBeLessThan(marginTable(doc));
    expect(doc.blocks.filter((b) => b.kind === 'table' && b.caption.startsWith('Margin table,')).length).toBeGreaterThan(1);
    const defs = doc.blocks[headings[0] + 2];
    expect(defs.kind).toBe('facts');
    const items = defs.kind === 'facts' ? defs.items : [];
    const titles = tableAt(doc, marginTable(doc)).columns.map((c) => c.title.replace(/ \(ps\)$/, ''));
    expect(items.map((i) => i.label)).toEqual(titles);
    for (const item of items) {
      const key = (Object.keys(MARGIN_COLUMNS) as (keyof typeof MARGIN_COLUMNS)[]).find((k) => MARGIN_COLUMNS[k].label === item.label)!;
      expect(item.value).toBe(COLUMN_DEFINITIONS[key]);
      // One place: the workbench's header tooltips are these very strings.
      expect(WORKBENCH_DEFINITIONS[key]).toBe(COLUMN_DEFINITIONS[key]);
    }
  });
});

describe('report waivers', () => {
  it('shows "waived" beside the computed status, never instead of it', () => {
    const doc = build();
    const status = column(doc, 'Status');
    expect(row(doc, 'DQ2')[status]).toBe('FAIL · waived');
    expect(row(doc, 'DQ3')[status]).toBe('FAIL · waived (stale)');
    expect(row(doc, 'DQ1')[status]).toBe('TIGHT');
    expect(tableAt(doc, marginTable(doc)).rows.find((r) => r.cells[0] === 'DQ2')!.status).toBe('fail');
    // Cover: the waived count of LANE0 beside its pass/tight/fail counts, which are unchanged (3 pass... as computed).
    const cover = tableAt(doc, doc.blocks.findIndex((b) => b.kind === 'table'));
    const lane = cover.rows.find((r) => r.cells[0] === 'LANE0')!.cells;
    expect(lane.slice(3, 7)).toEqual(['2', '1', '2', '2 (1 stale)']); // pass DQS0, DQ0; tight DQ1; fail DQ2, DQ3
  });

  it('lists each waiver in its own section with the check, comment, author, date and whether it is stale', () => {
    const doc = build();
    const start = doc.blocks.findIndex((b) => b.kind === 'heading' && b.text.startsWith('Waived nets'));
    const end = doc.blocks.findIndex((b, i) => i > start && b.kind === 'heading' && b.level <= 2);
    const section = texts(doc.blocks.slice(start, end));
    expect(section[0]).toBe('Waived nets (2)');
    expect(section).toContain('DQ2 (bus LANE0): FAIL · waived');
    expect(section).toContain('Waived check: setup margin, fail, margin -11.5 ps when waived');
    expect(section).toContain('Now: setup margin, fail, margin -11.5 ps');
    expect(section).toContain('Waiver: current: the result matches what was waived');
    expect(section).toContain('Author: A. Reviewer');
    expect(section).toContain('Date: 2026-11-30 15:00 UTC');
    expect(section).toContain('Comment: Lane trained at power-up (invented)');
    expect(section).toContain('DQ3 (bus LANE0): FAIL · waived (stale)');
    // -50 mV waived, -120 mV now (1.50 V - 1.62 V, hand calculation).
    expect(section).toContain('Waiver: STALE, needs review: overshoot got worse: -50.0 mV when waived, -120.0 mV now');
    expect(section.join('\n')).toMatch(/1 of 2 waivers are stale/);
  });

  it('says so when no net is waived', () => {
    const doc = build({ project: loadProject() });
    expect(texts(doc.blocks)).toContain('No net in this report is waived.');
  });
});

describe('margin CSV: the same columns', () => {
  it('carries worst margin, the delta, the previous solve and each waiver', () => {
    const rows = marginCsvRecords(loadResult(), undefined, { previous: PREVIOUS, waivers: project().waivers });
    const dq2 = rows.find((r) => r.net === 'DQ2')!;
    // Hand calculations as above, to 0.001 ps: -11.496 ps and +8.504 ps.
    expect(dq2.worst_margin_ps).toBe(-11.496);
    expect(dq2.delta_vs_previous_ps).toBe(8.504);
    expect(dq2.previous_solved_at).toBe(PREVIOUS.solvedAt);
    expect(dq2).toMatchObject({ waiver: 'waived', waived_check: 'setup margin', waived_status: 'fail', waived_margin: '-11.496 ps', waiver_author: 'A. Reviewer', waiver_review: '' });
    const dq3 = rows.find((r) => r.net === 'DQ3')!;
    expect(dq3).toMatchObject({ waiver: 'waived, stale', waived_margin: '-50 mV' });
    expect(String(dq3.waiver_review)).toMatch(/^overshoot got worse/);
    expect(rows.find((r) => r.net === 'DQ0')!.delta_vs_previous_ps).toBe(-2.352);
    expect(rows.find((r) => r.net === 'DQ1')!.delta_vs_previous_ps).toBe('');
    // Without extras the new columns are empty, not made up.
    expect(marginCsvRecords(loadResult()).find((r) => r.net === 'DQ2')).toMatchObject({ delta_vs_previous_ps: '', waiver: '', previous_solved_at: '' });
  });
});

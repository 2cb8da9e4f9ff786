import { describe, expect, it } from 'vitest';
import { buildReport, SKEW_NETS_PER_CHART } from '../../../core/report/build.js';
import type { ReportBlock, ReportDocument } from '../../../core/report/document.js';
import { psCell, formatMarginPs } from '../../../core/report/format.js';
import { CAUTION } from '../../../core/report/scope-text.js';
import { InputError } from '../../../core/errors.js';
import type { LayerProperties } from '../../../core/contract/api.js';
import { loadProject, loadResult, wideBus } from './fixture.js';

// Invented routing-layer properties (the report only formats them).
const LAYERS: LayerProperties[] = [
  { layer: 'IN3', structure: 'offset-stripline', width: 114.3e-6, z0: 50.2, epsEff: 4.1, velocity: 1.48e8, delayPerMetre: 6.75e-9 },
];
const AT = '2026-12-01T18:00:00.000Z';

function build(over: Partial<Parameters<typeof buildReport>[0]> = {}): ReportDocument {
  return buildReport({ project: loadProject(), result: loadResult(), layers: LAYERS, generatedAt: AT, ...over });
}

/** Every string the document would print, in order. */
function allText(doc: ReportDocument): string {
  const parts: string[] = [];
  const visit = (b: ReportBlock) => {
    if (b.kind === 'heading' || b.kind === 'paragraph') parts.push(b.text);
    if (b.kind === 'facts') for (const f of b.items) parts.push(`${f.label}: ${f.value}`);
    if (b.kind === 'list') parts.push(...b.items);
    if (b.kind === 'table') {
      parts.push(b.caption, b.table.columns.map((c) => c.title).join(' | '));
      for (const r of b.table.rows) parts.push(r.cells.join(' | '));
      if (!b.table.rows.length) parts.push(b.table.emptyText);
    }
    if (b.kind === 'chart') parts.push(b.chart.alt);
  };
  doc.blocks.forEach(visit);
  return parts.join('\n');
}

function tables(doc: ReportDocument) {
  return doc.blocks.flatMap((b) => (b.kind === 'table' ? [b] : []));
}

describe('buildReport', () => {
  it('puts project, revision, date, fingerprint, tool version and status per bus on the cover', () => {
    const doc = build();
    const text = allText(doc);
    const result = loadResult();
    expect(text).toContain('Project: Heron Ridge data logger');
    expect(text).toContain('Board revision: B2');
    expect(text).toContain('Report date: 2026-12-01 18:00 UTC');
    expect(text).toContain(`Input fingerprint: ${result.fingerprint}`);
    expect(text).toContain('Tool version: Slackline 0.1.0');
    const status = tables(doc)[0];
    expect(status.table.rows.map((r) => [r.cells[0], r.cells.at(-1)])).toEqual([['LANE0', 'FAIL'], ['CMD', 'PASS'], ['SPARE', 'NOT EVALUATED']]);
    // Worst margins as computed (fixture values), in the report's number format.
    expect(status.table.rows[0].cells[7]).toBe(psCell(result.buses[0].worstSetup));
    expect(status.table.rows[0].cells[7]).toBe('-11.5');
  });

  it('lists every net of a bus in its margin table with the worst corner and status', () => {
    const doc = build();
    const result = loadResult();
    const margin = tables(doc).find((t) => t.caption.startsWith('Margin table, LANE0'))!;
    expect(margin.table.rows.map((r) => r.cells[0])).toEqual(result.buses[0].nets.map((n) => n.net));
    const dq2 = margin.table.rows.find((r) => r.cells[0] === 'DQ2')!;
    // fixture: fixtures/report/generate-heron-ridge.ts; worst margin = min(-11.5, 320.9) = -11.5 (hand calculation);
    // no previous solve given, so the delta cell is empty
    expect(dq2.cells.slice(5)).toEqual(['-11.5', '320.9', '-11.5', '—', 'slow', 'FAIL']);
    expect(dq2.status).toBe('fail');
  });

  it('shows the worst net\'s setup budget line by line, and the items add up to the margin', () => {
    const doc = build();
    const budget = tables(doc).find((t) => t.caption.startsWith('Setup budget of the worst net, DQ2 at the slow corner'))!;
    expect(budget).toBeDefined();
    const items = budget.table.rows.filter((r) => !r.total);
    expect(items.map((r) => r.cells[2])).toEqual(['input', 'part model', 'simulation', 'input']);
    const sum = items.reduce((s, r) => s + Number(r.cells[1]), 0);
    const total = budget.table.rows.find((r) => r.total)!;
    // Each item is rounded to 0.1 ps for display, so the shown sum may differ by up to 4 x 0.05 ps.
    expect(Math.abs(sum - Number(total.cells[1]))).toBeLessThanOrEqual(0.2);
    expect(total.cells[1]).toBe('-11.5');
  });

  it('takes the budget from a net that has one, not from a clock checked for signal quality only', () => {
    const result = loadResult();
    const cmd = result.buses[1];
    // The clock CK carries no line items (quality only) and a zero margin that is not a budget.
    cmd.nets[0].corners = cmd.nets[0].corners.map((c) => ({ ...c, setupMargin: 0, holdMargin: 0, setupItems: [], holdItems: [] }));
    const budget = tables(build({ result })).find((t) => t.caption.startsWith('Setup budget of the worst net') && t.caption.includes('A1'));
    expect(budget).toBeDefined(); // A1 has the lowest setup margin among nets with a budget (fixture)
    expect(tables(build({ result })).some((t) => t.caption.includes('worst net, CK '))).toBe(false);
  });

  it('explains each failing or tight net in words, with the suggestion and a waveform when one is supplied', () => {
    const text = allText(build());
    expect(text).toContain('DQ2: FAIL');
    expect(text).toContain('setup margin -11.5 ps at slow corner');
    expect(text).toContain('DQ1: TIGHT');
    expect(text).toContain('overshoot at U5, rising edge, fast corner: 1.620 V against a limit of 1.500 V');
    expect(text).toContain('Suggested termination: 22 Ω series resistor at the driver; worst-corner signal margin -0.120 V before, 0.090 V after.');
    expect(text).toContain('No waveform was supplied for this net');
    expect(text).not.toContain('DQ0: PASS'); // passing nets get no section of their own
  });

  it('gives the length windows layout needs', () => {
    const windows = tables(build()).find((t) => t.caption.startsWith('Length windows for layout, LANE0'))!;
    const dq2 = windows.table.rows.find((r) => r.cells[0] === 'DQ2')!;
    // 52 mm = 2047 mil (1 mil = 25.4 µm exactly)
    expect(dq2.cells.slice(2, 6)).toEqual(['IN3', '52.00 / 2047', '30.00 / 1181', '47.50 / 1870']);
  });

  it('states what was modelled and neglected and that it does not replace sign-off', () => {
    const text = allText(build());
    expect(text).toContain('What was modelled and what was neglected');
    expect(text).toMatch(/lossless transmission lines/);
    expect(text).toMatch(/Crosstalk/);
    expect(text).toMatch(/Package models/);
    expect(text).toMatch(/Nonlinear drivers and receivers of parts given an IBIS model/); // scope-text.ts MODELLED
    expect(text).toMatch(/Clamp diodes and V-I curves of parts given only linear models/); // scope-text.ts NEGLECTED
    expect(text).toContain(CAUTION);
  });

  it('says a bus has no nets instead of failing', () => {
    const text = allText(build());
    expect(text).toContain('Bus SPARE has no nets, so it has no margins, skew or length windows to report.');
  });

  it('says a project has no buses instead of failing', () => {
    const result = { ...loadResult(), buses: [] };
    const project = { ...loadProject(), buses: [], nets: [] };
    const text = allText(build({ result, project }));
    expect(text).toContain('This project has no buses');
    expect(text).toContain('What was modelled and what was neglected');
  });

  it('reports one bus when asked, and names the bus list when the name is unknown', () => {
    const text = allText(build({ bus: 'CMD' }));
    expect(text).toContain('Bus CMD: PASS');
    expect(text).not.toContain('Bus LANE0');
    expect(() => build({ bus: 'NOPE' })).toThrow(InputError);
    expect(() => build({ bus: 'NOPE' })).toThrow('selected bus: no bus named "NOPE" in the results (buses: LANE0, CMD, SPARE)');
  });

  it('notes when routing-layer properties could not be computed', () => {
    const text = allText(build({ layers: { error: 'layer "IN3" defaultWidth: signal layer has no default trace width' } }));
    expect(text).toContain('Routing-layer properties could not be computed: layer "IN3" defaultWidth');
  });

  it(`splits a wide bus's skew chart into parts of at most ${SKEW_NETS_PER_CHART} nets, each with the strobes`, () => {
    const result = { ...loadResult(), buses: [wideBus(70)] };
    const charts = build({ result }).blocks.flatMap((b) => (b.kind === 'chart' ? [b.chart] : []));
    expect(charts).toHaveLength(3); // 70 data nets / (32 - 2 strobes) per chart = 3 charts
    for (const c of charts) {
      const names = (c.option as { yAxis: { data: string[] } }).yAxis.data;
      expect(names.length).toBeLessThanOrEqual(SKEW_NETS_PER_CHART);
      expect(names.slice(0, 2)).toEqual(['DQS_P', 'DQS_N']);
    }
  });

  it('never prints NaN, even for a result with missing numbers', () => {
    const result = loadResult();
    result.buses[0].nets[1].flightMin = Number.NaN;
    result.buses[0].nets[1].setupMargin = Number.POSITIVE_INFINITY;
    const text = allText(build({ result }));
    expect(text).not.toMatch(/NaN|Infinity/);
  });
});

describe('margin formatting', () => {
  it('writes ps with one decimal and an explicit sign in sentences', () => {
    expect(psCell(-35.04e-12)).toBe('-35.0');
    expect(psCell(-0.04e-12)).toBe('0.0'); // no "-0.0"
    expect(formatMarginPs(12.34e-12)).toBe('+12.3 ps');
    expect(formatMarginPs(-11.496e-12)).toBe('-11.5 ps');
    expect(formatMarginPs(Number.NaN)).toBe('—');
  });
});

describe('buildReport budget of the worst net', () => {
  it('names the data net that owns the margins, not a strobe row that repeats them', () => {
    // A strobe row carries the worst margins its data nets get (marginsFrom); the budget table must be
    // the data net's own (common practice, no source: a line item belongs to the net it was measured on).
    const result = loadResult();
    const bus = result.buses.find((b) => b.nets.length >= 2 && b.nets.some((n) => n.corners.some((c) => c.holdItems.length)))!;
    const lowestHold = (n: (typeof bus.nets)[number]) => Math.min(...n.corners.filter((c) => c.holdItems.length).map((c) => c.holdMargin!));
    const owner = bus.nets.filter((n) => n.corners.some((c) => c.holdItems.length)).sort((a, b) => lowestHold(a) - lowestHold(b))[0];
    const strobe = structuredClone(owner);
    strobe.net = 'STROBE_ROW';
    strobe.role = 'strobe';
    strobe.marginsFrom = `margins are the worst the strobe gives its data nets (${owner.net})`;
    for (const c of strobe.corners) c.holdMargin! -= 1e-12; // ties broken against the owner if rows were compared
    strobe.holdMargin! -= 1e-12;
    bus.nets.push(strobe);
    const text = allText(build({ result }));
    expect(text).not.toMatch(/Hold budget of the worst net, STROBE_ROW/);
    expect(text).toContain(`Hold budget of the worst net, ${owner.net} at the`);
  });
});

describe('IBIS models in the report', () => {
  it('names each IBIS model and the SHA-256 of its file in the stackup section', () => {
    const project = loadProject();
    const part = project.parts.find((p) => p.driver !== null)!;
    part.ibis = { file: 'wren_mc7.ibs', model: 'dq_drv40' };
    // The hash is whatever the project stores (the report copies it); 64 hex digits as stored.
    const sha256 = 'ab'.repeat(32);
    project.ibisFiles = [{ name: 'wren_mc7.ibs', sha256, text: '[IBIS Ver] 5.0' }];
    const text = allText(build({ project }));
    expect(text).toContain('IBIS models used');
    expect(text).toContain(`${part.name} | dq_drv40 | first using it | wren_mc7.ibs | ${sha256}`);
    // a part that names its [Pin] shows it (docs/ibis.md §9)
    part.ibis = { file: 'wren_mc7.ibs', model: 'dq_drv40', pin: 'A2' };
    expect(allText(build({ project }))).toContain(`${part.name} | dq_drv40 | A2 | wren_mc7.ibs | ${sha256}`);
    // Without IBIS parts there is no such table (common practice, no source: no empty tables).
    expect(allText(build())).not.toContain('IBIS models used');
  });
});

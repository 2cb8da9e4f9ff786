/**
 * The bus view's margin table as plain functions (renderer/src/lib/margin-table.ts): rows from results,
 * sorting and filtering. docs/design.md §1.1: the margin table sorts by worst margin and filters to failing or tight nets.
 */
import { describe, expect, it } from 'vitest';
import { COLUMN_DEFINITIONS, filterRows, marginsOwnerOf, routedLength, sortRows, toRow, worstCornerOf, worstSideCorners, type MarginRow } from '../../renderer/src/lib/margin-table.js';
import type { NetResult } from '../../core/budget/results.js';
import type { NetDefinition } from '../../core/project/model.js';

const ps = 1e-12;

/** A row with neutral values; tests override only what they look at. */
function row(net: string, over: Partial<MarginRow> = {}): MarginRow {
  return {
    net, role: 'data', status: 'pass', worstCorner: 'slow', flightMin: 100 * ps, flightMax: 200 * ps, skew: 0,
    setup: 50 * ps, hold: 50 * ps, margin: 50 * ps, routed: 0.02, windowMin: null, windowMax: null, reason: '',
    marginsFrom: null, marginsOwner: null, windowElement: null, windowCurrent: null, outdated: false, delta: null, ...over,
  };
}
const names = (rows: MarginRow[]) => rows.map((r) => r.net);

describe('toRow and routedLength', () => {
  const definition: NetDefinition = {
    name: 'DQ3', bus: 'MEM', role: 'data',
    driver: { part: 'CTL', node: 'd', designator: 'U1' },
    receivers: [{ part: 'MEMX', node: 'r', designator: 'U2' }],
    elements: [
      { kind: 'segment', a: 'd', b: 'v', layer: 'L1', width: 100e-6, length: 0.012 },
      { kind: 'via', a: 'v', farads: 0.3e-12 },
      { kind: 'resistor', a: 'v', b: 'w', ohms: 22 },
      { kind: 'segment', a: 'w', b: 'r', layer: 'L3', width: 90e-6, length: 0.031 },
    ],
    rails: {},
  };
  const result: NetResult = {
    net: 'DQ3', bus: 'MEM', role: 'data', status: 'tight', reasons: ['hold margin 8 ps at fast corner', 'second reason'],
    worstCorner: 'fast', flightMin: 210 * ps, flightMax: 260 * ps, skew: 12 * ps, setupMargin: 40 * ps, holdMargin: 8 * ps,
    corners: [], quality: [], lengthWindow: { elementIndex: 3, layer: 'L3', current: 0.031, min: 0.02, max: 0.04, note: '' },
    suggestion: null, inputHash: 'h',
  };

  it('sums only the routed segments of a net (vias, resistors carry no length); no definition is 0 m', () => {
    // common practice, no source: routed length = sum of trace segment lengths
    expect(routedLength(definition)).toBeCloseTo(0.043, 15); // 1e-15 m: float sum of two decimals
    expect(routedLength(undefined)).toBe(0);
  });

  it('takes the worse of setup and hold as the margin, the first reason, the length window, no marginsFrom', () => {
    // docs/design.md §1.1 / core/budget/results.ts contract: margin column = worst of setup and hold
    const r = toRow(result, definition);
    expect(r.margin).toBe(8 * ps);
    expect(r.setup).toBe(40 * ps);
    expect(r.hold).toBe(8 * ps);
    expect(r.reason).toBe('hold margin 8 ps at fast corner');
    expect(r.windowMin).toBe(0.02);
    expect(r.windowMax).toBe(0.04);
    expect(r.marginsFrom).toBeNull();
    expect(r.status).toBe('tight');
  });

  it('keeps marginsFrom of a strobe row and gives null windows and an empty reason when absent', () => {
    // core/budget/results.ts contract: marginsFrom is set when the margins are not the net's own
    const r = toRow({ ...result, reasons: [], lengthWindow: null, marginsFrom: 'worst of DQ0..DQ7' }, undefined);
    expect(r.marginsFrom).toBe('worst of DQ0..DQ7');
    expect(r.windowMin).toBeNull();
    expect(r.windowMax).toBeNull();
    expect(r.reason).toBe('');
    expect(r.routed).toBe(0);
  });
});

describe('sortRows', () => {
  it('orders net names naturally: DQ2 before DQ10, either direction reverses it exactly', () => {
    // docs/design.md §1.1: sortable margin table; natural order is common practice, no source
    const rows = [row('DQ10'), row('DQ2'), row('DQ1'), row('A0'), row('dq3')];
    expect(names(sortRows(rows, 'net', true))).toEqual(['A0', 'DQ1', 'DQ2', 'dq3', 'DQ10']);
    expect(names(sortRows(rows, 'net', false))).toEqual(['DQ10', 'dq3', 'DQ2', 'DQ1', 'A0']);
  });

  it('sorts numbers by value, not by text (−5 ps < 40 ps < 100 ps)', () => {
    // docs/design.md §1.1: sort by margin; numeric order is common practice, no source
    const rows = [row('a', { margin: 100 * ps }), row('b', { margin: -5 * ps }), row('c', { margin: 40 * ps })];
    expect(names(sortRows(rows, 'margin', true))).toEqual(['b', 'c', 'a']);
    expect(names(sortRows(rows, 'margin', false))).toEqual(['a', 'c', 'b']);
  });

  it('orders status fail < tight < pass (worst first when ascending)', () => {
    // docs/design.md §1.1: failing and tight nets are what the review looks for; common practice, no source
    const rows = [row('p', { status: 'pass' }), row('f', { status: 'fail' }), row('t', { status: 'tight' })];
    expect(names(sortRows(rows, 'status', true))).toEqual(['f', 't', 'p']);
    expect(names(sortRows(rows, 'status', false))).toEqual(['p', 't', 'f']);
  });

  it('on equal values puts a net\'s own margins before a strobe row repeating them, in both directions', () => {
    // core/budget/results.ts marginsFrom contract: the strobe row repeats its worst data net's margins
    const rows = [
      row('DQS', { role: 'strobe', margin: -20 * ps, marginsFrom: 'worst data net DQ5' }),
      row('DQ5', { margin: -20 * ps }),
      row('DQ1', { margin: 30 * ps }),
    ];
    expect(names(sortRows(rows, 'margin', true))).toEqual(['DQ5', 'DQS', 'DQ1']);
    expect(names(sortRows(rows, 'margin', false))).toEqual(['DQ1', 'DQ5', 'DQS']);
  });

  it('breaks remaining ties by natural net name, ascending whatever the direction', () => {
    // common practice, no source: a stable, predictable order among equal rows
    const rows = [row('DQ10', { status: 'fail' }), row('DQ9', { status: 'fail' }), row('DQ2', { status: 'pass' })];
    expect(names(sortRows(rows, 'status', true))).toEqual(['DQ9', 'DQ10', 'DQ2']);
    expect(names(sortRows(rows, 'status', false))).toEqual(['DQ2', 'DQ9', 'DQ10']);
  });

  it('sorts text columns (role, worst corner) naturally and does not change the input array', () => {
    // common practice, no source
    const rows = [row('x', { worstCorner: 'slow 10' }), row('y', { worstCorner: 'fast' }), row('z', { worstCorner: 'slow 2' })];
    const copy = [...rows];
    expect(names(sortRows(rows, 'worstCorner', true))).toEqual(['y', 'z', 'x']);
    expect(rows).toEqual(copy);
  });

  it('puts a non-finite value after every number in both directions', () => {
    // common practice, no source: a missing number sorts last; it is never shown as the best or worst
    const rows = [row('a', { skew: 10 * ps }), row('b', { skew: Number.NaN }), row('c', { skew: -3 * ps })];
    expect(names(sortRows(rows, 'skew', true))).toEqual(['c', 'a', 'b']);
    expect(names(sortRows(rows, 'skew', false))).toEqual(['a', 'c', 'b']);
  });
});

describe('filterRows', () => {
  const rows = [
    row('DQ0', { status: 'pass' }),
    row('DQ1', { status: 'tight' }),
    row('DQ12', { status: 'fail' }),
    row('DQS0', { status: 'fail', role: 'strobe' }),
    row('CK', { status: 'pass', role: 'clock' }),
  ];

  it('all keeps every row, attention drops passing rows, failing keeps only failures', () => {
    // docs/design.md §1.1: filterable to failing or tight nets
    expect(names(filterRows(rows, 'all', ''))).toEqual(['DQ0', 'DQ1', 'DQ12', 'DQS0', 'CK']);
    expect(names(filterRows(rows, 'attention', ''))).toEqual(['DQ1', 'DQ12', 'DQS0']);
    expect(names(filterRows(rows, 'failing', ''))).toEqual(['DQ12', 'DQS0']);
  });

  it('searches net name and role, ignoring case and surrounding spaces, combined with the filter', () => {
    // common practice, no source: a table search box matches substrings, case-insensitive
    expect(names(filterRows(rows, 'all', '  dq1 '))).toEqual(['DQ1', 'DQ12']);
    expect(names(filterRows(rows, 'all', 'STROBE'))).toEqual(['DQS0']);
    expect(names(filterRows(rows, 'failing', 'dq1'))).toEqual(['DQ12']);
    expect(names(filterRows(rows, 'all', 'nothing'))).toEqual([]);
    expect(names(filterRows(rows, 'attention', '   '))).toEqual(['DQ1', 'DQ12', 'DQS0']);
  });
});

describe('one definition per column', () => {
  const timing = (corner: string, setup: number, hold: number) => ({ corner, flightMin: 0, flightMax: 0, setupMargin: setup * ps, holdMargin: hold * ps, setupItems: [], holdItems: [] });
  const base: NetResult = {
    net: 'LB_D7', bus: 'LB', role: 'data', status: 'pass', reasons: [], worstCorner: 'fast', flightMin: 0, flightMax: 0, skew: 0,
    // Invented: worst setup at slow (+3347 ps), worst hold at fast (+5964 ps) — the disagreement the issue reports.
    setupMargin: 3347 * ps, holdMargin: 5964 * ps,
    corners: [timing('slow', 3347, 7000), timing('typical', 4000, 6500), timing('fast', 6100, 5964)],
    quality: [], lengthWindow: null, suggestion: null, inputHash: 'h',
  };

  it('names as worst corner the corner of the worse margin, so the row and the budget panel agree', () => {
    // Definition in COLUMN_DEFINITIONS.worstCorner (docs/workbench.md): min over corners of min(setup, hold) -> slow, +3347 ps
    expect(worstCornerOf(base)).toBe('slow');
    expect(toRow(base, undefined).worstCorner).toBe('slow');
    expect(worstSideCorners(base)).toEqual({ setup: 'slow', hold: 'fast' });
    const atWorst = base.corners.find((c) => c.corner === worstCornerOf(base))!;
    expect(Math.min(atWorst.setupMargin!, atWorst.holdMargin!)).toBe(toRow(base, undefined).margin);
  });

  it('keeps the services\' corner for a strobe row and names the data net its margins belong to', () => {
    const strobe = { ...base, role: 'strobe', marginsFrom: 'margins are the worst the strobe gives its 8 data nets (worst: DQ58)' };
    expect(worstCornerOf(strobe)).toBe('fast');
    expect(toRow(strobe, undefined).marginsOwner).toBe('DQ58');
    expect(marginsOwnerOf('signal quality only: margins shown are the bus worst')).toBeNull();
    expect(marginsOwnerOf('margins are the worst the strobe gives its 0 data nets (worst: undefined)')).toBeNull();
  });

  it('gives the change of the worst margin against the previous solve, none without a previous number', () => {
    // Definition COLUMN_DEFINITIONS.delta: worst now − worst before; worst now = +3347 ps (slow setup).
    const before = { ...base, setupMargin: 3400 * ps, holdMargin: 3300 * ps };
    expect(toRow(base, undefined, false, before).delta).toBeCloseTo(47 * ps, 24); // 3347 − 3300 = +47 ps; 1e-24 s: float subtraction
    expect(toRow(base, undefined).delta).toBeNull();
    expect(toRow(base, undefined, false, { ...before, holdMargin: null as unknown as number }).delta).toBeNull();
  });

  it('takes the previous worst margin as a number too (the stored previous solve, getPreviousSolve)', () => {
    // Same hand calculation: worst now +3347 ps, stored worst before +3300 ps -> +47 ps; −50 ps before -> +3397 ps.
    expect(toRow(base, undefined, false, 3300 * ps).delta).toBeCloseTo(47 * ps, 24); // 1e-24 s: float subtraction
    expect(toRow(base, undefined, false, -50 * ps).delta).toBeCloseTo(3397 * ps, 24);
    expect(toRow(base, undefined, false, null).delta).toBeNull(); // that solve had no number for the net
  });

  it('defines every column, routed and length window apart', () => {
    for (const key of ['net', 'role', 'status', 'worstCorner', 'flightMin', 'flightMax', 'skew', 'setup', 'hold', 'margin', 'delta', 'routed', 'window'] as const) {
      expect(COLUMN_DEFINITIONS[key].length).toBeGreaterThan(5);
    }
    expect(COLUMN_DEFINITIONS.routed).toMatch(/sum of all its segments/);
    expect(COLUMN_DEFINITIONS.window).toMatch(/one segment/);
  });
});

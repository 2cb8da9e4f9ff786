/**
 * The corner table as edited (renderer/src/lib/corner-form.ts): drafts, parsing with every problem
 * named by row and field, and where a refusal from the services belongs. Contracts: core/project/model.ts
 * Corner; main/services/project/validate-project.ts validateCorners (its `where` texts).
 */
import { describe, expect, it } from 'vitest';
import {
  convertWidthUnit, draftOf, narrowestTrace, newDraft, parseCorners, placeServerError, rowWhere, sameCorners, widthUnit,
  type CornerDraft,
} from '../../renderer/src/lib/corner-form.js';
import type { Corner, NetDefinition, StackupLayer } from '../../core/project/model.js';

const MIL = 25.4e-6; // NIST SP 811 (2008): 1 mil = 0.001 in = 25.4 µm exactly

// Invented corners for these tests (not a vendor's).
const slow: Corner = { name: 'slow', driverStrength: 1.15, edgeRate: 1.2, dk: 1.05, widthDelta: -12.345e-6, rail: 0.95, cin: 1.1, tco: 'max' };
const typical: Corner = { name: 'typical', driverStrength: 1, edgeRate: 1, dk: 1, widthDelta: 0, rail: 1, cin: 1, tco: 'typ' };
const fast: Corner = { name: 'fast', driverStrength: 0.85, edgeRate: 0.8, dk: 0.95, widthDelta: 0.5 * MIL, rail: 1.05, cin: 0.9, tco: 'min' };

const drafts = (unit: 'µm' | 'mil' = 'µm') => [slow, typical, fast].map((c) => draftOf(c, unit));
const edit = (d: CornerDraft, over: Partial<CornerDraft>): CornerDraft => ({ ...d, ...over });

describe('drafts', () => {
  it('shows a stored corner as text in the width unit of the length unit in use', () => {
    // corner-form.ts: µm beside metric lengths, mil beside imperial ones
    expect(widthUnit('mm')).toBe('µm');
    expect(widthUnit('mil')).toBe('mil');
    const d = draftOf(slow, 'µm');
    expect([d.name, d.driverStrength, d.edgeRate, d.dk, d.rail, d.cin, d.widthDelta, d.tco])
      .toEqual(['slow', '1.15', '1.2', '1.05', '0.95', '1.1', '-12.3 µm', 'max']);
    expect(draftOf(fast, 'mil').widthDelta).toBe('0.5 mil');
  });

  it('gives a new row typical factors and the first unused name, ignoring case', () => {
    // core/project/model.ts Corner: each factor is 1 at typical; names unique (validateCorners)
    const existing = [edit(draftOf(slow, 'µm'), { name: 'Corner 3' }), draftOf(typical, 'µm')];
    const d = newDraft(existing, 'µm');
    expect([d.name, d.driverStrength, d.edgeRate, d.dk, d.rail, d.cin, d.widthDelta, d.tco, d.origin])
      .toEqual(['corner 4', '1', '1', '1', '1', '1', '0 µm', 'typ', null]);
    expect(new Set([...existing, d].map((x) => x.id)).size).toBe(3);
  });

  it('names rows by position and name for messages', () => {
    // core/errors.ts contract: messages name where
    expect(rowWhere(1, { name: ' typical ' })).toBe('corner 2 (typical)');
    expect(rowWhere(0, { name: '  ' })).toBe('corner 1');
  });
});

describe('parseCorners', () => {
  it('gives back the stored corners exactly when nothing was edited, even values finer than shown', () => {
    // corner-form.ts contract: saving an untouched row changes nothing (-12.345 µm shows as -12.3 µm)
    const parsed = parseCorners(drafts(), 'µm', null);
    expect(parsed.errors).toEqual({});
    expect(parsed.corners).toEqual([slow, typical, fast]);
    expect(sameCorners(parsed.corners!, [slow, typical, fast])).toBe(true);
  });

  it('reads edited fields: percentages, bare width deltas in the column unit, trimmed names', () => {
    // quantity-text.ts contract: bare number in the column unit; "%" is 0.01
    const [s, t, f] = drafts('mil');
    const parsed = parseCorners([edit(s, { name: ' slow ', edgeRate: '125 %', widthDelta: '-0.75' }), t, f], 'mil', null);
    expect(parsed.errors).toEqual({});
    expect(parsed.corners![0].name).toBe('slow');
    expect(parsed.corners![0].edgeRate).toBe(125 * 0.01);
    expect(parsed.corners![0].widthDelta).toBe(-0.75 * MIL);
    expect(parsed.corners![0].driverStrength).toBe(1.15);
    expect(sameCorners(parsed.corners!, [slow, typical, fast])).toBe(false);
  });

  it('refuses a factor at or below zero and a non-finite factor, keyed by row id and field', () => {
    // validate-project.ts validateCorners: factors must be greater than 0 and finite
    const [s, t, f] = drafts();
    const parsed = parseCorners([edit(s, { edgeRate: '0' }), edit(t, { dk: '1e999' }), edit(f, { cin: '-0.9' })], 'µm', null);
    expect(parsed.corners).toBeNull();
    expect(parsed.errors).toEqual({
      [`${s.id}.edgeRate`]: 'corner 1 (slow) edge rate ×: 0 is out of range: must be greater than 0',
      [`${t.id}.dk`]: 'corner 2 (typical) Dk ×: value is not a finite number',
      [`${f.id}.cin`]: 'corner 3 (fast) input C ×: -0.9 is out of range: must be greater than 0',
    });
  });

  it('refuses an empty name and a name already used, ignoring case, on the later row', () => {
    // validate-project.ts requireUnique: names non-empty and unique; case-insensitive here to avoid look-alikes
    const [s, t, f] = drafts();
    const parsed = parseCorners([s, edit(t, { name: '   ' }), edit(f, { name: ' SLOW ' })], 'µm', null);
    expect(parsed.corners).toBeNull();
    expect(parsed.errors).toEqual({
      [`${t.id}.name`]: 'corner 2 name: a name is needed',
      [`${f.id}.name`]: 'corner 3 (SLOW) name: “SLOW” is already the name of corner 1',
    });
  });

  it('refuses an empty table', () => {
    // validate-project.ts validateCorners: at least one corner is needed
    expect(parseCorners([], 'µm', null)).toEqual({
      corners: null,
      errors: { table: 'at least one corner is needed: the budgets report the worst corner' },
    });
  });

  it('refuses a width delta that leaves the narrowest trace with zero or negative width, and accepts one just above', () => {
    // geometry: a trace of width w at a corner is w + widthDelta, which must stay above zero
    const narrowest = { width: 3 * MIL, where: 'a segment of DQ0 on L3' };
    const [s, t, f] = drafts('mil');
    const parsed = parseCorners([edit(s, { widthDelta: '-3' }), t, f], 'mil', narrowest);
    expect(parsed.corners).toBeNull();
    expect(parsed.errors).toEqual({
      [`${s.id}.widthDelta`]: 'corner 1 (slow) width delta: -3 mil would leave no copper on the narrowest trace (3 mil, a segment of DQ0 on L3)',
    });
    const ok = parseCorners([edit(s, { widthDelta: '-2.99' }), t, f], 'mil', narrowest);
    expect(ok.errors).toEqual({});
    expect(ok.corners![0].widthDelta).toBe(-2.99 * MIL);
  });

  it('names a width delta that does not parse, not the narrowing rule', () => {
    // core/errors.ts contract: the message says what is wrong with the text itself
    const [s, t, f] = drafts();
    const parsed = parseCorners([edit(s, { widthDelta: 'thin' }), t, f], 'µm', { width: 1e-6, where: 'x' });
    expect(parsed.errors).toEqual({
      [`${s.id}.widthDelta`]: 'corner 1 (slow) width delta: expected a number with an optional length unit, got "thin"',
    });
  });
});

describe('narrowestTrace', () => {
  const layers: StackupLayer[] = [
    { name: 'L1', kind: 'copper', thickness: 35e-6, role: 'signal', defaultWidth: 120e-6 },
    { name: 'D1', kind: 'dielectric', thickness: 100e-6, dk: 4 },
    { name: 'L3', kind: 'copper', thickness: 18e-6, role: 'signal', defaultWidth: 90e-6 },
  ];
  const net = (name: string, width: number): NetDefinition => ({
    name, bus: 'B', role: 'data', driver: { part: 'P', node: 'a', designator: 'U1' }, receivers: [{ part: 'P', node: 'b', designator: 'U2' }],
    elements: [{ kind: 'segment', a: 'a', b: 'b', layer: 'L1', width, length: 0.01 }, { kind: 'via', a: 'b', farads: 1e-13 }], rails: {},
  });

  it('takes the smallest width over layer defaults and routed segments, and says where it is', () => {
    // corner-form.ts contract: segments and layer defaults both count
    expect(narrowestTrace({ stackup: { name: 's', layers }, nets: [net('DQ0', 100e-6)] })).toEqual({ width: 90e-6, where: 'default width of L3' });
    expect(narrowestTrace({ stackup: { name: 's', layers }, nets: [net('DQ0', 100e-6), net('DQ7', 75e-6)] }))
      .toEqual({ width: 75e-6, where: 'a segment of DQ7 on L1' });
    expect(narrowestTrace({ stackup: { name: 's', layers: [layers[1]] }, nets: [] })).toBeNull();
  });
});

describe('convertWidthUnit', () => {
  it('re-renders untouched rows from the stored value and keeps it exact; converts edited rows; keeps text it cannot read', () => {
    // corner-form.ts contract; 25.4 µm = 1 mil (NIST SP 811)
    const [s, t, f] = drafts('µm');
    const converted = convertWidthUnit([s, edit(t, { widthDelta: '-25.4' }), edit(f, { widthDelta: 'abc' })], 'µm', 'mil');
    expect(converted.map((d) => d.widthDelta)).toEqual(['-0.49 mil', '-1 mil', 'abc']);
    const parsed = parseCorners(converted.slice(0, 1), 'mil', null);
    expect(parsed.corners![0].widthDelta).toBe(slow.widthDelta);
  });
});

describe('placeServerError', () => {
  const rows = [draftOf({ ...slow, name: 'slow' }, 'µm'), draftOf({ ...slow, name: 'slow hot' }, 'µm'), draftOf(typical, 'µm')];
  const [s, sh, t] = rows;

  it('puts field refusals on the row and field the services name, longest name first', () => {
    // validate-project.ts validateCorners: where = `corner NAME key`, `corner NAME` for the Tco choice
    expect(placeServerError('corner slow hot widthDelta', rows)).toBe(`${sh.id}.widthDelta`);
    expect(placeServerError('corner slow driverStrength', rows)).toBe(`${s.id}.driverStrength`);
    expect(placeServerError('corner typical', rows)).toBe(`${t.id}.tco`);
    expect(placeServerError('corner slow hot', rows)).toBe(`${sh.id}.tco`);
    expect(placeServerError('corner typical colour', rows)).toBe(`${t.id}.name`);
  });

  it('puts a duplicate name on that row and anything unplaced on the table', () => {
    // validate-project.ts requireUnique: where = `corner "NAME"`; 'corners' for an empty set
    expect(placeServerError('corner "typical"', rows)).toBe(`${t.id}.name`);
    expect(placeServerError('corner "nominal"', rows)).toBe('table');
    expect(placeServerError('corners', rows)).toBe('table');
    expect(placeServerError('corner', rows)).toBe('table');
    expect(placeServerError(null, rows)).toBe('table');
  });

  it('places a row whose own name holds quotes', () => {
    // common practice, no source: names are free text
    const quotedName = draftOf({ ...typical, name: '"nominal"' }, 'µm');
    expect(placeServerError('corner "nominal"', [quotedName])).toBe(`${quotedName.id}.tco`);
  });
});

describe('sameCorners', () => {
  it('compares every field in order', () => {
    // corner-form.ts contract: used to tell whether there is anything to save
    expect(sameCorners([slow, typical], [{ ...slow }, { ...typical }])).toBe(true);
    expect(sameCorners([slow, typical], [typical, slow])).toBe(false);
    expect(sameCorners([slow], [{ ...slow, tco: 'typ' }])).toBe(false);
    expect(sameCorners([slow], [{ ...slow, widthDelta: slow.widthDelta + 1e-9 }])).toBe(false);
    expect(sameCorners([slow], [slow, typical])).toBe(false);
  });
});

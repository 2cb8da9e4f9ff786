/**
 * A bus's timing inputs as edited (renderer/src/lib/bus-timing-form.ts): text in ps parsed back into a
 * BusDefinition with every problem named, and where a refusal from the services belongs. Contracts:
 * core/project/model.ts BusDefinition; main/services/project/validate-project.ts validateBus (limits, `where`).
 */
import { describe, expect, it } from 'vitest';
import {
  allowanceWhere, busDraftOf, newAllowance, parseBus, placeServerError, sameTiming, TIMING_FIELDS, type BusDraft,
} from '../../renderer/src/lib/bus-timing-form.js';
import type { BusDefinition } from '../../core/project/model.js';

const ps = 1e-12;

// Invented buses for these tests.
const cc: BusDefinition = {
  name: 'ADDR', kind: 'common-clock', description: '', referenceNet: 'CK',
  timing: { kind: 'common-clock', cycleTime: 2500 * ps, clockSkew: -12.34 * ps, jitter: 25 * ps },
  allowances: [
    { name: 'crosstalk', value: 15 * ps, appliesTo: 'both', note: 'estimate' },
    { name: 'ISI', value: 8.25 * ps, appliesTo: 'setup', note: '' },
  ],
};
const ss: BusDefinition = {
  name: 'MEM', kind: 'source-synchronous', description: '', referenceNet: 'DQS',
  timing: { kind: 'source-synchronous', tValidBefore: 200 * ps, tValidAfter: 180 * ps },
  allowances: [],
};
const withDraft = (draft: BusDraft, timing: BusDraft['timing'], allowances = draft.allowances): BusDraft =>
  ({ ...draft, timing: { ...draft.timing, ...timing }, allowances });

describe('busDraftOf and fields', () => {
  it('shows the fields of the bus\'s budget model in ps and its allowances', () => {
    // docs/design.md §6 budget models: common clock has Tcycle, clock skew, jitter; source-synchronous Tvalid before/after
    expect(TIMING_FIELDS['common-clock'].map((f) => f.key)).toEqual(['cycleTime', 'clockSkew', 'jitter']);
    expect(TIMING_FIELDS['source-synchronous'].map((f) => f.key)).toEqual(['tValidBefore', 'tValidAfter']);
    const d = busDraftOf(cc);
    expect(d.timing).toEqual({ cycleTime: '2500 ps', clockSkew: '-12.3 ps', jitter: '25 ps' });
    expect(d.allowances.map((a) => [a.name, a.value, a.appliesTo, a.note])).toEqual([
      ['crosstalk', '15 ps', 'both', 'estimate'],
      ['ISI', '8.3 ps', 'setup', ''],
    ]);
    expect(busDraftOf(ss).timing).toEqual({ tValidBefore: '200 ps', tValidAfter: '180 ps' });
  });

  it('names a new allowance with the first unused number, ignoring case, at 0 ps for both margins', () => {
    // common practice, no source
    const d = busDraftOf(cc);
    const taken = [...d.allowances, { ...d.allowances[0], name: 'Allowance 3' }];
    const a = newAllowance(taken);
    expect([a.name, a.value, a.appliesTo, a.note, a.origin]).toEqual(['allowance 4', '0 ps', 'both', '', null]);
    expect(allowanceWhere(2, a)).toBe('allowance 3 (allowance 4)');
    expect(allowanceWhere(0, { name: ' ' })).toBe('allowance 1');
  });
});

describe('parseBus', () => {
  it('gives back the stored bus exactly when nothing was edited, even values finer than shown', () => {
    // bus-timing-form.ts contract: fields left as shown keep their stored values (-12.34 ps shows as -12.3 ps)
    const parsed = parseBus(cc, busDraftOf(cc));
    expect(parsed.errors).toEqual({});
    expect(parsed.bus).toEqual(cc);
    expect(sameTiming(parsed.bus!, cc)).toBe(true);
  });

  it('reads edited times: bare numbers in ps, typed units win, notes trimmed', () => {
    // quantity-text.ts contract: a bare number is in the column unit
    const d = busDraftOf(cc);
    const allowances = [{ ...d.allowances[0], value: '0.02 ns', note: '  from coupled-line run  ' }, d.allowances[1]];
    const parsed = parseBus(cc, withDraft(d, { cycleTime: '1875', jitter: '30' }, allowances));
    expect(parsed.errors).toEqual({});
    const t = parsed.bus!.timing as { cycleTime: number; clockSkew: number; jitter: number };
    expect(t.cycleTime).toBe(1875 * ps);
    expect(t.clockSkew).toBe(-12.34 * ps);
    expect(t.jitter).toBe(30 * ps);
    expect(parsed.bus!.allowances[0]).toEqual({ name: 'crosstalk', value: 0.02 * 1e-9, appliesTo: 'both', note: 'from coupled-line run' });
    expect(sameTiming(parsed.bus!, cc)).toBe(false);
  });

  it('applies the limits the services enforce: cycle time above 0, jitter at least 0; skew may be negative', () => {
    // validate-project.ts validateBus: cycleTime positive, jitter non-negative, clockSkew any finite value
    const d = busDraftOf(cc);
    const parsed = parseBus(cc, withDraft(d, { cycleTime: '0', clockSkew: '-40', jitter: '-1' }));
    expect(parsed.bus).toBeNull();
    expect(parsed.errors).toEqual({
      'timing.cycleTime': 'bus ADDR cycle time (Tcycle): 0 ps is out of range: must be greater than 0 ps',
      'timing.jitter': 'bus ADDR jitter (jitter): -1 ps is out of range: must be at least 0 ps',
    });
  });

  it('refuses empty, non-numeric and non-finite times, naming the bus and the field', () => {
    // core/errors.ts contract: every refusal names where; never NaN shown to people (docs/design.md §8)
    const d = busDraftOf(ss);
    const parsed = parseBus(ss, withDraft(d, { tValidBefore: '', tValidAfter: '1e999' }));
    expect(parsed.errors).toEqual({
      'timing.tValidBefore': 'bus MEM valid before (Tvalid,before): a value in ps is needed',
      'timing.tValidAfter': 'bus MEM valid after (Tvalid,after): value is not a finite number',
    });
  });

  it('refuses an allowance without a name, with a value that does not parse, or with a name already used (ignoring case)', () => {
    // validate-project.ts validateBus requireUnique + requireFinite on allowance values
    const d = busDraftOf(cc);
    const extra = { ...newAllowance(d.allowances), name: ' Crosstalk ', value: '5 ps' };
    const blank = { ...newAllowance(d.allowances), name: '', value: 'lots' };
    const parsed = parseBus(cc, withDraft(d, {}, [...d.allowances, extra, blank]));
    expect(parsed.bus).toBeNull();
    expect(parsed.errors).toEqual({
      [`${extra.id}.name`]: 'bus ADDR allowance 3 (Crosstalk) name: “Crosstalk” is already the name of allowance 1',
      [`${blank.id}.name`]: 'bus ADDR allowance 4 name: a name is needed',
      [`${blank.id}.value`]: 'bus ADDR allowance 4 value: expected a number with an optional time unit, got "lots"',
    });
  });
});

describe('sameTiming', () => {
  it('compares the timing numbers and every allowance field', () => {
    // bus-timing-form.ts contract: tells whether there is anything to save
    expect(sameTiming(cc, structuredClone(cc))).toBe(true);
    expect(sameTiming(cc, { ...cc, timing: { kind: 'common-clock', cycleTime: 2500 * ps, clockSkew: -12.34 * ps, jitter: 26 * ps } })).toBe(false);
    expect(sameTiming(cc, { ...cc, allowances: [cc.allowances[0], { ...cc.allowances[1], appliesTo: 'hold' }] })).toBe(false);
    expect(sameTiming(cc, { ...cc, allowances: [cc.allowances[0]] })).toBe(false);
    expect(sameTiming(cc, ss)).toBe(false);
  });
});

describe('placeServerError', () => {
  const d = busDraftOf({ ...cc, allowances: [...cc.allowances, { name: '2" stub', value: 3 * ps, appliesTo: 'hold', note: '' }] });
  const [crosstalk, , stub] = d.allowances;

  it('puts timing refusals on their field, by the words the services use', () => {
    // validate-project.ts validateBus: `bus NAME cycle time`, `... clock skew`, `... jitter`, `... valid-before time`
    expect(placeServerError('bus ADDR cycle time', 'ADDR', d)).toBe('timing.cycleTime');
    expect(placeServerError('bus ADDR clock skew', 'ADDR', d)).toBe('timing.clockSkew');
    expect(placeServerError('bus ADDR jitter', 'ADDR', d)).toBe('timing.jitter');
    expect(placeServerError('bus MEM valid-before time', 'MEM', d)).toBe('timing.tValidBefore');
    expect(placeServerError('bus MEM valid-after time', 'MEM', d)).toBe('timing.tValidAfter');
  });

  it('puts an allowance value refusal on its value and a duplicate on its name', () => {
    // validate-project.ts: `bus NAME allowance ANAME` (value), `bus NAME allowance "ANAME"` (duplicate)
    expect(placeServerError('bus ADDR allowance crosstalk', 'ADDR', d)).toBe(`${crosstalk.id}.value`);
    expect(placeServerError('bus ADDR allowance "crosstalk"', 'ADDR', d)).toBe(`${crosstalk.id}.name`);
  });

  it('reads an inch mark inside a name as part of the name, not as quoting', () => {
    // common practice, no source: allowance names are free text ("2\" stub")
    expect(placeServerError('bus ADDR allowance 2" stub', 'ADDR', d)).toBe(`${stub.id}.value`);
    expect(placeServerError('bus ADDR allowance "2" stub"', 'ADDR', d)).toBe(`${stub.id}.name`);
  });

  it('puts anything else on the form as a whole', () => {
    // bus-timing-form.ts contract: unplaced refusals belong to the form
    expect(placeServerError(null, 'ADDR', d)).toBe('form');
    expect(placeServerError('bus ADDR timing', 'ADDR', d)).toBe('form');
    expect(placeServerError('bus ADDR allowance', 'ADDR', d)).toBe('form');
    expect(placeServerError('bus ADDR allowance nothing', 'ADDR', d)).toBe('form');
    expect(placeServerError('bus ADDR2 cycle time', 'ADDR', d)).toBe('form');
    expect(placeServerError('bus name', 'ADDR', d)).toBe('form');
  });
});

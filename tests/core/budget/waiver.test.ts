/**
 * Which check a waiver covers and when it goes stale (core/budget/waiver.ts; docs/workbench.md,
 * "Waivers"), on the invented report fixture's results (fixtures/report/README.md) and on copies of
 * them changed by hand. Expected values are hand calculations from the fixture's numbers.
 */
import { describe, expect, it } from 'vitest';
import type { NetResult } from '../../../core/budget/results.js';
import type { Waiver } from '../../../core/project/model.js';
import { waivableCheck, waivedStatusText, waiverState, WAIVER_TOLERANCE } from '../../../core/budget/waiver.js';
import { loadResult } from '../report/fixture.js';

const net = (name: string): NetResult => loadResult().buses.flatMap((b) => b.nets).find((n) => n.net === name)!;
const PS = 1e-12;

function waiverOf(result: NetResult): Waiver {
  return { net: result.net, ...waivableCheck(result)!, comment: 'accepted (invented)', author: 'tester', at: '2026-12-01T10:00:00.000Z' };
}

describe('the check a waiver covers', () => {
  it('a failing timed net: the smaller of setup and hold when it is below zero', () => {
    // DQ2: setup -11.496 ps, hold +320.888 ps -> setup margin fails at -11.496 ps (fixture numbers).
    expect(waivableCheck(net('DQ2'))).toEqual({ check: 'setup margin', status: 'fail', margin: net('DQ2').setupMargin, unit: 's' });
    expect(net('DQ2').setupMargin).toBeCloseTo(-11.496e-12, 20);
  });

  it('a net failing a signal check only: that check, with its room inside the limit in volts', () => {
    // DQ3: overshoot 1.62 V against 1.50 V: room = 1.50 - 1.62 = -0.12 V (hand calculation); margins positive.
    const check = waivableCheck(net('DQ3'))!;
    expect(check).toMatchObject({ check: 'overshoot', status: 'fail', unit: 'V' });
    expect(check.margin).toBeCloseTo(-0.12, 12); // float subtraction only
  });

  it('a tight net: the margin inside the guard band; a passing net: nothing to waive', () => {
    // DQ1: setup +17.336 ps inside the 20 ps guard band, hold +295.592 ps -> setup margin, tight, +17.336 ps.
    expect(waivableCheck(net('DQ1'))).toEqual({ check: 'setup margin', status: 'tight', margin: net('DQ1').setupMargin, unit: 's' });
    expect(net('DQ1').setupMargin).toBeCloseTo(17.336e-12, 20);
    expect(waivableCheck(net('DQ0'))).toBeNull();
  });
});

describe('a waiver against a later result', () => {
  const dq2 = net('DQ2');
  const waiver = waiverOf(dq2);

  it('stays current while the result is the same or better', () => {
    expect(waiverState(waiver, dq2)).toEqual({ state: 'current', why: '' });
    expect(waiverState(waiver, { ...dq2, setupMargin: dq2.setupMargin! + 3 * PS }).state).toBe('current');
    // Worse by less than the tolerance (0.05 ps, half the report's 0.1 ps precision): rounding, not a change.
    expect(waiverState(waiver, { ...dq2, setupMargin: dq2.setupMargin! - 0.8 * WAIVER_TOLERANCE.s }).state).toBe('current');
  });

  it('goes stale when the waived margin gets worse', () => {
    // -11.496 ps waived, -12.496 ps now: 1 ps worse (hand calculation), past the 0.05 ps tolerance.
    const state = waiverState(waiver, { ...dq2, setupMargin: dq2.setupMargin! - 1 * PS });
    expect(state.state).toBe('stale');
    expect(state.why).toBe('setup margin got worse: -11.5 ps when waived, -12.5 ps now');
  });

  it('goes stale when another check is the worst, the status changes, or the net passes', () => {
    // Hold now below setup and below zero: hold margin is the worst check.
    expect(waiverState(waiver, { ...dq2, holdMargin: -30 * PS }).why).toBe('waived setup margin, but now hold margin is the worst check (fail)');
    const tight = waiverOf(net('DQ1'));
    expect(waiverState(tight, { ...net('DQ1'), status: 'fail', setupMargin: -2 * PS }).why).toBe('waived as tight, now fail');
    expect(waiverState(waiver, { ...dq2, status: 'pass', setupMargin: 40 * PS, reasons: [] }).why).toMatch(/^the net passes now/);
  });

  it('cannot be judged without a result, and the status text keeps the real status first', () => {
    expect(waiverState(waiver, undefined).state).toBe('current');
    expect(waivedStatusText('fail', 'current')).toBe('fail · waived');
    expect(waivedStatusText('tight', 'stale')).toBe('tight · waived (stale)');
    expect(waivedStatusText('fail', null)).toBe('fail');
  });
});

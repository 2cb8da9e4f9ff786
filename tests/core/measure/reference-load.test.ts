/**
 * Driver into its reference load (docs/design.md §4-5): the crossing of Vmeas that compensated flight time
 * is measured from. Closed forms: a linear ramp behind Rout into R to VTT is a resistive divider of the
 * ramp (Ohm's law); with a capacitor it is the ramp response of a first-order RC (standard circuit
 * theory: v(t) = k·(t − τ(1 − e^(−t/τ))) during the ramp).
 */
import { describe, expect, it } from 'vitest';
import { InputError } from '../../../core/errors.js';
import type { DriverSpec } from '../../../core/circuit/types.js';
import { referenceLoadCrossing } from '../../../core/measure/reference-load.js';

const driver: DriverSpec = {
  node: 'out', vlow: 0, vhigh: 3.3, routHigh: 15, routLow: 15, riseTime: 0.5e-9, fallTime: 0.5e-9,
  refLoad: { ohms: 50, vtt: 0, farads: 0 }, vmeas: 1.65,
};

describe('referenceLoadCrossing', () => {
  it('resistive load: the pin is the ramp times 50/65, so 1.65 V is crossed at 2.145/3.3 of the 0.625 ns ramp', () => {
    // Linear interpolation of a linear ramp is exact: round-off tolerance.
    expect(Math.abs(referenceLoadCrossing(driver, 'rising') - (2.145 / 3.3) * 0.625e-9)).toBeLessThan(1e-18);
    // Falling from the DC point 3.3·50/65 = 2.538 V toward 0: crosses 1.65 V when the source is at 2.145 V.
    expect(Math.abs(referenceLoadCrossing(driver, 'falling') - ((3.3 - 2.145) / 3.3) * 0.625e-9)).toBeLessThan(1e-18);
  });

  it('resistive load, pull-up weaker than pull-down: the closed form equals the simulated reference load', () => {
    // The closed form and the solver march share only the ramp-start rule; the march is exact for a
    // resistive divider of a linear ramp, so they agree to round-off (1e-18 s).
    const asym = { ...driver, routHigh: 30, routLow: 12, fallTime: 0.4e-9, refLoad: { ohms: 50, vtt: 1.2, farads: 0 } };
    for (const edge of ['rising', 'falling'] as const) {
      const ramp = (edge === 'rising' ? asym.riseTime : asym.fallTime) / 0.8;
      const simulated = referenceLoadCrossing(asym, edge, { step: ramp / 500 });
      expect(Math.abs(referenceLoadCrossing(asym, edge) - simulated)).toBeLessThan(1e-18);
    }
  });

  it('RC load: matches the first-order ramp response within 0.1 ps (trapezoidal rule at ramp/400)', () => {
    const rc = { ...driver, refLoad: { ohms: 50, vtt: 0, farads: 5e-12 } };
    const tau = ((50 * 15) / 65) * 5e-12; // Thevenin resistance 15 || 50 ohm times C
    const k = (3.3 * 50) / 65 / 0.625e-9; // final-value slope of the divided ramp, V/s
    const v = (t: number) => k * (t - tau * (1 - Math.exp(-t / tau)));
    let lo = 0;
    let hi = 0.625e-9; // the crossing happens during the ramp here (v(0.625 ns) > 1.65 V)
    for (let i = 0; i < 200; i++) {
      const mid = (lo + hi) / 2;
      if (v(mid) < 1.65) lo = mid;
      else hi = mid;
    }
    expect(v(0.625e-9)).toBeGreaterThan(1.65);
    expect(Math.abs(referenceLoadCrossing(rc, 'rising') - lo)).toBeLessThan(0.1e-12);
  });

  it('names the field when there is no reference load or Vmeas is never reached', () => {
    expect(() => referenceLoadCrossing({ ...driver, refLoad: null }, 'rising')).toThrow(InputError);
    expect(() => referenceLoadCrossing({ ...driver, refLoad: null }, 'rising')).toThrow(/driver\.refLoad: missing/);
    expect(() => referenceLoadCrossing({ ...driver, vmeas: 3.0 }, 'rising')).toThrow(/driver\.vmeas: the rising output never crosses 3 V/);
  });
});

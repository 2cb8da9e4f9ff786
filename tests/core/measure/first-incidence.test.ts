/**
 * First-incidence switching judged against the arrival times of the network (docs/design.md §5): the
 * incident wave is what reaches a receiver before the first reflected wave that can push it further
 * in the edge's direction (a reflection of the edge's sign) can, from anywhere in the net. Arrival times are worked out by hand from the line delays in the comments; levels from the
 * lattice (bounce) diagram of docs/design.md §2.1 (launch V+ = ΔVs·Z0/(Z0 + Zs), Γ = (ZT − Z0)/(ZT + Z0),
 * transmission 1 + Γ at a junction).
 */
import { describe, expect, it } from 'vitest';
import { parseNetFile } from '../../../core/circuit/parse.js';
import { simulateNet, type Waveform } from '../../../core/solver/transient.js';
import { incidentLag, measureEdge } from '../../../core/measure/edge.js';
import { firstReflectionArrivals } from '../../../core/measure/arrivals.js';
import { valueAt } from '../../../core/measure/crossings.js';

const ns = 1e-9;
/** Arrival sums of two to four delays given in ns: exact up to double round-off (1e-24 s); 1e-18 s bound. */
const SUM_TOL = 1e-18;
const rx = (node: string) => ({ node, vil: 0.63, vih: 1.17 });
const driver = { node: 'drv', vlow: 0, vhigh: 1.8, rout: 25, riseTime: '100ps', fallTime: '100ps' };
/** Full ramp of that driver: 100 ps / 0.8 (docs/design.md §2.2). */
const RAMP = 125e-12;

describe('arrival of the first reflected wave', () => {
  it("T-branch: the other branch's open end is the first reflection of the edge's sign", () => {
    // drv -1 ns- J; J -0.3 ns- A; J -0.5 ns- B (50 Ω lines, open ends). At J a wave on one branch sees
    // the other two lines in parallel, 25 Ω: Γ = (25 − 50)/75 = −1/3, passed on with 1 + Γ = 2/3.
    // At A: its own echo comes back off J with +1·(−1/3) < 0 (at 1.9 ns, opposing the edge); B's open
    // end sends +1·2/3 > 0, arriving at 1 + 2·0.5 + 0.3 = 2.3 ns. At B: A's echo at 1 + 2·0.3 + 0.5 = 2.1 ns.
    const c = parseNetFile({
      driver, receivers: [rx('A'), rx('B')],
      elements: [
        { kind: 'line', a: 'drv', b: 'J', z0: 50, delay: '1ns' },
        { kind: 'line', a: 'J', b: 'A', z0: 50, delay: '0.3ns' },
        { kind: 'line', a: 'J', b: 'B', z0: 50, delay: '0.5ns' },
      ],
    }, 't-branch');
    const r = firstReflectionArrivals(c, RAMP);
    expect(Math.abs(r.get('A')! - 2.3 * ns)).toBeLessThan(SUM_TOL);
    expect(Math.abs(r.get('B')! - 2.1 * ns)).toBeLessThan(SUM_TOL);
  });

  it('mid-bus driver: the open far side returns before the receiver\'s own round trip', () => {
    // drv -0.4 ns- OPEN; drv -1 ns- R. The open end's echo (+1) passes the driver junction (25 Ω ∥ 50 Ω
    // = 16.7 Ω: Γ = −0.5, on with +0.5) and reaches R at 2·0.4 + 1 = 1.8 ns.
    const c = parseNetFile({
      driver, receivers: [rx('R')],
      elements: [{ kind: 'line', a: 'drv', b: 'open', z0: 50, delay: '0.4ns' }, { kind: 'line', a: 'drv', b: 'R', z0: 50, delay: '1ns' }],
    }, 'mid-bus');
    expect(Math.abs(firstReflectionArrivals(c, RAMP).get('R')! - 1.8 * ns)).toBeLessThan(SUM_TOL);
  });

  it('fly-by: short stubs and equal-line joints end no incident wave; a long stub reflects off its tap', () => {
    // drv -0.5- m -0.5- t0 (m joins two equal 50 Ω lines: no reflection there); t0 -0.05- d0 stub;
    // t0 -0.2- t1 -0.05- d1; t1 -0.1- end (open).
    const c = parseNetFile({
      driver, receivers: [rx('d0'), rx('d1')],
      elements: [
        { kind: 'line', a: 'drv', b: 'm', z0: 50, delay: '0.5ns' },
        { kind: 'line', a: 'm', b: 't0', z0: 50, delay: '0.5ns' },
        { kind: 'line', a: 't0', b: 'd0', z0: 60, delay: '0.05ns' },
        { kind: 'line', a: 't0', b: 't1', z0: 50, delay: '0.2ns' },
        { kind: 'line', a: 't1', b: 'd1', z0: 60, delay: '0.05ns' },
        { kind: 'line', a: 't1', b: 'end', z0: 50, delay: '0.1ns' },
      ],
    }, 'fly-by');
    // 125 ps ramp: each 50 ps stub has a 100 ps round trip, shorter than the ramp: a capacitive stub,
    // so the taps are plain joints. The first reflection is the open end's: at t1 1.2 + 2·0.1 = 1.4 ns,
    // d1 1.45 ns; back at t0 1.6 ns, d0 1.65 ns.
    const short = firstReflectionArrivals(c, RAMP);
    expect(Math.abs(short.get('d0')! - 1.65 * ns)).toBeLessThan(SUM_TOL);
    expect(Math.abs(short.get('d1')! - 1.45 * ns)).toBeLessThan(SUM_TOL);
    // 50 ps ramp: the stubs are long against the edge. A stub's own echo comes back off its tap with
    // Γ = (25 − 60)/(25 + 60) = −0.41 (opposing the edge); bounced twice it is (−0.41)² = +0.17, of the
    // edge's sign and above the 10 % floor: at d0 1.05 + 4·0.05 = 1.25 ns. At d1 the same double bounce
    // would come at 1.45 ns, but d0's echo, passed on with (1 − 0.41)·(1 − 0.29) = +0.42, comes first:
    // 1.05 + 0.05 + 0.2 + 0.05 = 1.35 ns.
    // The same stubs ending in a package (series 0.3 Ω and 1 nH, then 0.5 pF to ground) before the
    // receiver: still a reactive end, a capacitive stub for the 125 ps ramp (no resistive shunt there).
    const packaged = parseNetFile({
      driver, receivers: [rx('d0'), rx('d1')],
      elements: [
        ...c.elements.filter((e) => e.kind === 'line' && e.b !== 'd0' && e.b !== 'd1').map((e) => e.kind === 'line'
          ? { kind: 'line', a: e.a, b: e.b, z0: e.z0, delay: e.delay } : e),
        { kind: 'line', a: 't0', b: 'p0', z0: 60, delay: '0.05ns' }, { kind: 'resistor', a: 'p0', b: 'q0', ohms: 0.3 },
        { kind: 'inductor', a: 'q0', b: 'd0', henries: 1e-9 }, { kind: 'capacitor', a: 'd0', b: 'gnd', farads: 0.5e-12 },
        { kind: 'line', a: 't1', b: 'p1', z0: 60, delay: '0.05ns' }, { kind: 'resistor', a: 'p1', b: 'q1', ohms: 0.3 },
        { kind: 'inductor', a: 'q1', b: 'd1', henries: 1e-9 }, { kind: 'capacitor', a: 'd1', b: 'gnd', farads: 0.5e-12 },
      ],
    }, 'fly-by-packaged');
    const behindPackage = firstReflectionArrivals(packaged, RAMP);
    expect(Math.abs(behindPackage.get('d0')! - 1.65 * ns)).toBeLessThan(SUM_TOL);
    expect(Math.abs(behindPackage.get('d1')! - 1.45 * ns)).toBeLessThan(SUM_TOL);
    const long = firstReflectionArrivals(c, 50e-12);
    expect(Math.abs(long.get('d0')! - 1.25 * ns)).toBeLessThan(SUM_TOL);
    expect(Math.abs(long.get('d1')! - 1.35 * ns)).toBeLessThan(SUM_TOL);
  });
});

describe('reflected-wave switching is not taken for first incidence (mid-bus driver, open end)', () => {
  // drv -0.4 ns- open end; drv -1 ns- R, with 62.5 Ω to ground at R (receiver VIH 1.17 V).
  // Lattice by hand: the driver (25 Ω) sees two 50 Ω lines in parallel (25 Ω): each line is launched
  // with 1.8·25/(25 + 25) = 0.90 V. At R, Γ = (62.5 − 50)/(62.5 + 50) = 0.111: the first wave brings
  // 0.90·1.111 = 1.00 V at 1.0 ns, short of VIH. The open end doubles its 0.90 V and sends +0.90 V back;
  // at the driver it meets 25 Ω ∥ 50 Ω = 16.7 Ω, so 0.90·2·16.7/(16.7 + 50) = 0.45 V goes on into the
  // line to R and arrives at 0.8 + 1.0 = 1.8 ns, adding 0.45·1.111 = 0.50 V: 1.50 V, past VIH only then.
  const c = parseNetFile({
    driver, receivers: [rx('R')],
    elements: [
      { kind: 'line', a: 'drv', b: 'open', z0: 50, delay: '0.4ns' },
      { kind: 'line', a: 'drv', b: 'R', z0: 50, delay: '1ns' },
      { kind: 'resistor', a: 'R', b: 'gnd', ohms: 62.5 },
    ],
    stop: '8ns',
  }, 'mid-bus-reproducer');
  const waves = simulateNet(c);
  const m = measureEdge(waves.rising, c, 'R', 'rising');
  const at = (t: number) => valueAt(waves.rising.t, waves.rising.v[waves.rising.nodes.indexOf('R')], t);

  it('the simulation shows the hand lattice: 1.00 V before 1.8 ns, 1.50 V after (10 mV: the 125 ps ramp is fully inside each plateau)', () => {
    expect(Math.abs(at(1.5 * ns) - 1.0)).toBeLessThan(0.01);
    expect(Math.abs(at(2.1 * ns) - 1.5)).toBeLessThan(0.01);
  });

  it('the first-incidence window ends at the 1.8 ns reflection, the first wave reaches 1.00 V, and the check fails', () => {
    expect(Math.abs(m.firstIncidenceWindow - 1.8 * ns)).toBeLessThan(SUM_TOL);
    expect(Math.abs(m.vFirstIncidence - 1.0)).toBeLessThan(0.01);
    expect(m.firstIncidence).toBe(false);
  });

  it('the ledge at 1.00 V inside the band (0.8 ns, longer than the 125 ps ramp) fails the monotonic check', () => {
    // inside [0.63, 1.17] V from the 1.0 ns arrival to the 1.8 ns reflection: 0.8 ns without progress
    // (less the ramp's last part above 0.63 V: the ledge starts once the level stops rising, ≈ 1.1 ns)
    expect(m.longestLedge).toBeGreaterThan(0.6 * ns);
    expect(m.monotonic).toBe(false);
  });
});

describe('a 600 ps ledge in the band of a hand-made waveform', () => {
  // The circuit of tests/core/measure/edge.test.ts: 400 ps 10-90 % -> 500 ps full ramp.
  const c = parseNetFile({
    driver: { node: 'drv', vlow: 0, vhigh: 1.1, rout: 25, riseTime: '400ps', fallTime: '400ps' },
    elements: [{ kind: 'line', a: 'drv', b: 'rx', z0: 50, delay: '1ns' }],
    receivers: [{ node: 'rx', vil: 0.5, vih: 1.0 }],
    stop: '5ns',
  }, 'synthetic');
  const wave = (corners: [number, number][]): Waveform => {
    const t = Float64Array.from({ length: 5001 }, (_, i) => i * 1e-12);
    const ct = Float64Array.from(corners, (x) => x[0]);
    const cv = Float64Array.from(corners, (x) => x[1]);
    const v = Float64Array.from(t, (x) => valueAt(ct, cv, x));
    return { edge: 'rising', t, nodes: ['drv', 'rx'], v: [v, v], step: 1e-12, initial: Float64Array.of(0, 0), final: Float64Array.of(1.1, 1.1) };
  };
  it('rising to 0.8 V, flat 600 ps, then on to 1.1 V: no reversal, yet a ledge longer than the ramp fails', () => {
    const m = measureEdge(wave([[0, 0], [1 * ns, 0], [1.2 * ns, 0.8], [1.8 * ns, 0.8], [2 * ns, 1.1], [5 * ns, 1.1]]), c, 'rx', 'rising');
    expect(Math.abs(m.longestLedge - 0.6 * ns)).toBeLessThan(2e-12); // sampled at 1 ps: within two samples
    expect(m.monotonic).toBe(false);
  });
  it('the same edge with a 300 ps ledge (shorter than the 500 ps ramp) passes', () => {
    const m = measureEdge(wave([[0, 0], [1 * ns, 0], [1.2 * ns, 0.8], [1.5 * ns, 0.8], [1.7 * ns, 1.1], [5 * ns, 1.1]]), c, 'rx', 'rising');
    expect(m.monotonic).toBe(true);
  });
});

describe('the lag of the incident edge moves the window (docs/design.md §5)', () => {
  // A unit ramp 0 -> 1 V over 100 ps that starts at 1.000 ns, sampled every 5 ps; the line delay says 1 ns.
  const t = Float64Array.from({ length: 601 }, (_, k) => k * 5e-12);
  const rampAt = (start: number) => Float64Array.from(t, (x) => Math.min(1, Math.max(0, (x - start) / 100e-12)));
  it('an edge that starts on time has no lag (the 2 % / 10 % extrapolation is exact for a ramp; 1e-18 s)', () => {
    expect(incidentLag(t, rampAt(1e-9), 0, 1, 1, 1e-9)).toBeLessThan(1e-18);
  });
  it('an edge that starts 80 ps late (a buffer\'s switching delay) has 80 ps of lag (1e-15 s: interpolation on the sample grid)', () => {
    expect(Math.abs(incidentLag(t, rampAt(1.08e-9), 0, 1, 1, 1e-9) - 80e-12)).toBeLessThan(1e-15);
  });
  it('a falling edge is read the same way, and a receiver that never moves 10 % has none', () => {
    const falling = Float64Array.from(rampAt(1.05e-9), (v) => 1 - v);
    expect(Math.abs(incidentLag(t, falling, 1, -1, 1, 1e-9) - 50e-12)).toBeLessThan(1e-15);
    expect(incidentLag(t, Float64Array.from(t, () => 0.05), 0, 1, 1, 1e-9)).toBe(0);
  });
});

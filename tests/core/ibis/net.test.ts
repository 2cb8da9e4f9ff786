/**
 * IBIS forms of the net file (docs/ibis.md §7) and the pad solver's convergence: step halving
 * (docs/design.md §2: prove convergence by halving the step) on invented nets (fixtures/ibis/).
 */
import { readFileSync } from 'node:fs';
import { describe, expect, it } from 'vitest';
import { parseNetFile } from '../../../core/circuit/parse.js';
import type { Circuit } from '../../../core/circuit/types.js';
import { attachIbisModels, ibisFilesOf } from '../../../core/ibis/attach.js';
import { parseIbis } from '../../../core/ibis/parse.js';
import { InputError } from '../../../core/errors.js';
import { chooseStep, chooseStop, simulateEdge, simulateNet } from '../../../core/solver/transient.js';
import { valueAt } from '../../../core/measure/crossings.js';

const url = (f: string) => new URL(`../../../fixtures/ibis/${f}`, import.meta.url);
const json = (f: string) => JSON.parse(readFileSync(url(f), 'utf8'));
const files = (c: Circuit) => new Map(ibisFilesOf(c).map((f) => [f, parseIbis(readFileSync(url(f), 'utf8'), f)]));
function load(f: string, edit?: (j: Record<string, any>) => void): Circuit {
  const j = json(f);
  edit?.(j);
  const c = parseNetFile(j, f);
  return attachIbisModels(c, files(c), f);
}

describe('net file IBIS forms', () => {
  it('resolves driver and receivers; receivers take Vinl/Vinh unless given', () => {
    const c = load('net-coupled-inputs.json');
    expect(c.driver.pad!.label).toBe('wren_mc7.ibs dq_drv60 typ');
    expect(c.driver.vhigh).toBe(1.5); // [Voltage Range] typ of wren_mc7.ibs
    expect(c.receivers[0].vil).toBe(0.65); // dq_in Vinl (heron_m4.ibs)
    expect(c.receivers[0].vref).toBeCloseTo(0.75, 12);
    expect(c.receivers[1].vil).toBe(0.6); // given in the net file
    expect(c.receivers[0].pad!.cComp).toBeCloseTo(1.6e-12, 24);
  });
  it('the driver corner applies to the receivers too', () => {
    const c = load('net-coupled-inputs.json', (j) => (j.driver.corner = 'max'));
    expect(c.driver.vhigh).toBe(1.575);
    expect(c.receivers[0].pad!.cComp).toBeCloseTo(1.8e-12, 24); // C_comp max of dq_in
  });
  it('names the field of a bad corner, an unknown model and an unresolved reference', () => {
    expect(() => parseNetFile({ ...json('net-series.json'), driver: { node: 'pad', ibis: { file: 'wren_mc7.ibs', model: 'dq_drv40' }, corner: 'slow' } }, 'n.json'))
      .toThrow(/n\.json: driver\.corner/);
    const c = parseNetFile({ ...json('net-series.json'), driver: { node: 'pad', ibis: { file: 'wren_mc7.ibs', model: 'nope' } } }, 'n.json');
    try {
      attachIbisModels(c, files(c), 'n.json');
      throw new Error('expected an InputError');
    } catch (e) {
      expect(e).toBeInstanceOf(InputError);
      expect((e as InputError).where).toBe('n.json: driver.ibis.model');
      expect((e as InputError).reason).toMatch(/unknown model name "nope"/);
    }
    expect(() => simulateNet(c)).toThrow(/driver\.ibis: the IBIS model is not resolved/);
  });
});

describe('pad solver converges when the step is halved', () => {
  // Tolerance: 0.5 % of the rail swing, common practice, no source (the linear solver's own
  // step-halving test holds 0.2 % at the ramp rule; the pad Newton adds no error of its own).
  for (const name of ['net-series.json', 'net-flyby.json', 'net-coupled-inputs.json']) {
    it(name, () => {
      const c = load(name);
      const stop = chooseStop(c);
      for (const edge of ['rising', 'falling'] as const) {
        const h = chooseStep(c, edge, stop);
        const a = simulateEdge(c, edge, { stop, step: h });
        const b = simulateEdge(c, edge, { stop, step: h / 2 });
        let worst = 0;
        for (const [i] of a.nodes.entries()) for (let m = 0; m < a.t.length; m++) worst = Math.max(worst, Math.abs(a.v[i][m] - valueAt(b.t, b.v[i], a.t[m])));
        expect(worst / (c.driver.vhigh - c.driver.vlow), edge).toBeLessThanOrEqual(0.005);
      }
    });
  }
  it('a pad driver starts from its DC point and ends at the static V-I level', () => {
    // Hand check: at the end of a rising edge into net-series (no DC load but the input's clamps),
    // the pad settles at the pull-up rail, 1.5 V, within the clamp leakage (< 1 mV).
    const c = load('net-series.json');
    const w = simulateEdge(c, 'rising');
    const pad = w.v[w.nodes.indexOf('pad')];
    expect(pad[0]).toBeCloseTo(0, 3);
    expect(pad[pad.length - 1]).toBeCloseTo(1.5, 3);
    expect(w.final[w.nodes.indexOf('rx')]).toBeCloseTo(1.5, 3);
  });
});

describe('pad solvers are reused within a net and reset per run', () => {
  // simulateNet runs both edges (and their four DC points) over one compiled circuit, whose pad
  // solvers are kept per matrix and reset by begin(); simulateEdge compiles afresh for one edge. The
  // same arithmetic must give the same samples, bit for bit (common practice, no source).
  for (const name of ['net-p2p-clamp.json', 'net-series.json', 'net-flyby.json', 'net-ramp-only.json', 'net-coupled-inputs.json']) {
    it(name, () => {
      const c = load(name);
      const both = simulateNet(c);
      for (const edge of ['rising', 'falling'] as const) {
        const alone = simulateEdge(c, edge);
        expect(both[edge].nodes).toEqual(alone.nodes);
        both[edge].v.forEach((w, i) => expect(Array.from(w), `${edge} ${alone.nodes[i]}`).toEqual(Array.from(alone.v[i])));
      }
    });
  }
});

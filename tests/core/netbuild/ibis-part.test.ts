/**
 * A project part with an IBIS model (docs/ibis.md §9) builds the same circuit as the equivalent IBIS
 * net file read the way `slackline sim` reads it (parseNetFile, parseIbis, attachIbisModels): same
 * receiver waveform, the pin's package as visible elements, the model's reference load, and the
 * project corner mapped onto the IBIS column. Files: the invented fixtures/ibis models.
 */
import { readFileSync } from 'node:fs';
import { join } from 'node:path';
import { describe, expect, it } from 'vitest';
import { parseNetFile } from '../../../core/circuit/parse.js';
import { attachIbisModels } from '../../../core/ibis/attach.js';
import { parseIbis } from '../../../core/ibis/parse.js';
import { buildNetCircuit, ibisColumnOf, ibisFileRecord, partIbis, partIbisCurves } from '../../../core/netbuild/index.js';
import type { Corner, NetDefinition, PartModel } from '../../../core/project/model.js';
import { simulateNet } from '../../../core/solver/transient.js';

const DIR = join(import.meta.dirname, '../../../fixtures/ibis');
const wrenText = readFileSync(join(DIR, 'wren_mc7.ibs'), 'utf8');
const heronText = readFileSync(join(DIR, 'heron_m4.ibs'), 'utf8');
const files = [ibisFileRecord('wren_mc7.ibs', wrenText), ibisFileRecord('heron_m4.ibs', heronText)];

// Linear data stays required (fallback and timing); values invented.
const linearDriver = { vol: 0, voh: 1.5, routHigh: 40, routLow: 40, riseTime: 300e-12, fallTime: 300e-12, tcoMin: 0.4e-9, tcoMax: 1.1e-9, refLoad: { ohms: 25, vtt: 0.6, farads: 0 }, vmeas: 0.6 };
const linearReceiver = { cin: 1.5e-12, vil: 0.65, vih: 0.85, vref: 0.75, odtOhms: 60, odtVtt: 0.75, vmaxAbs: 1.9, vminAbs: -0.4, tsetup: 0.1e-9, thold: 0.1e-9 };
const parts: PartModel[] = [
  { name: 'CTL', description: 'controller DQ', ioStandard: '', driver: linearDriver, receiver: null, ibis: { file: 'wren_mc7.ibs', model: 'dq_drv40' } },
  { name: 'MEM', description: 'memory DQ input', ioStandard: '', driver: null, receiver: linearReceiver, ibis: { file: 'heron_m4.ibs', model: 'dq_in' } },
];
const net: NetDefinition = {
  name: 'DQ_T', bus: 'B', role: 'data',
  driver: { part: 'CTL', node: 'pin', designator: 'U1' },
  receivers: [{ part: 'MEM', node: 'rx', designator: 'U2' }],
  elements: [
    { kind: 'resistor', a: 'pin', b: 'line', ohms: 22 },
    { kind: 'line', a: 'line', b: 'rx', z0: 50, delay: 800e-12 },
  ],
  rails: {},
};
const typical: Corner = { name: 'typical', driverStrength: 1, edgeRate: 1, dk: 1, widthDelta: 0, rail: 1, cin: 1, tco: 'typ' };

describe('project parts with IBIS models', () => {
  it('gives the receiver waveform of the equivalent IBIS net file', () => {
    const project = buildNetCircuit(net, { name: '', layers: [] }, parts, typical, {}, files);
    // The same net written as a net file: both pins' packages as elements ([Package] typ of each file:
    // wren_mc7 R 0.25 Ω, L 2.4 nH, C 0.9 pF; heron_m4 R 0.3 Ω, L 1.8 nH, C 0.7 pF), node names as built.
    const netFile = {
      version: 1,
      driver: { node: 'pin~die', ibis: { file: 'wren_mc7.ibs', model: 'dq_drv40' }, corner: 'typ' },
      elements: [
        { kind: 'resistor', a: 'pin', b: 'line', ohms: 22 },
        { kind: 'line', a: 'line', b: 'rx', z0: 50, delay: '800ps' },
        { kind: 'resistor', a: 'rx~die', b: 'rx~die#pkg', ohms: 0.3 },
        { kind: 'inductor', a: 'rx~die#pkg', b: 'rx', henries: '1.8nH' },
        { kind: 'capacitor', a: 'rx', b: 'gnd', farads: '0.7pF' },
        { kind: 'resistor', a: 'pin~die', b: 'pin~die#pkg', ohms: 0.25 },
        { kind: 'inductor', a: 'pin~die#pkg', b: 'pin', henries: '2.4nH' },
        { kind: 'capacitor', a: 'pin', b: 'gnd', farads: '0.9pF' },
      ],
      receivers: [{ node: 'rx~die', ibis: { file: 'heron_m4.ibs', model: 'dq_in' }, vil: 0.65, vih: 0.85 }],
      stop: project.stop,
    };
    const parsed = new Map([['wren_mc7.ibs', parseIbis(wrenText, 'wren_mc7.ibs')], ['heron_m4.ibs', parseIbis(heronText, 'heron_m4.ibs')]]);
    const viaFile = attachIbisModels(parseNetFile(netFile, 'dq.json'), parsed, 'dq.json');

    // The package is in the project circuit as visible elements (common practice, no source: the
    // user sees what is simulated); element order differs from the file's, so compare as sets, values
    // to 12 digits (the two parsers scale "1.8nH" with different rounding in the last bit).
    const key = (e: object) => JSON.stringify(e, (_k, x: unknown) => (typeof x === 'number' ? Number(x.toPrecision(12)) : x));
    expect(new Set(project.elements.map(key))).toEqual(new Set(viaFile.elements.map(key)));
    expect(project.receivers[0].node).toBe('rx~die');

    const a = simulateNet(project);
    const b = simulateNet(viaFile);
    for (const edge of ['rising', 'falling'] as const) {
      const wa = a[edge];
      const wb = b[edge];
      expect(wa.t.length).toBe(wb.t.length);
      const va = wa.v[wa.nodes.indexOf('rx~die')];
      const vb = wb.v[wb.nodes.indexOf('rx~die')];
      let worst = 0;
      for (let k = 0; k < va.length; k++) worst = Math.max(worst, Math.abs(va[k] - vb[k]));
      // Same circuit and solver; the element order changes only the floating-point summation order
      // in the matrix (rounding, far below 1 µV).
      expect(worst).toBeLessThan(1e-6);
      // The waveform swings (a flat line would pass the comparison): wren_mc7 rails 0 to 1.5 V typ.
      expect(Math.max(...va) - Math.min(...va)).toBeGreaterThan(1);
    }
  });

  it("uses the model's Vmeas and Rref/Cref/Vref as the reference load, not the part's linear ones", () => {
    const c = buildNetCircuit(net, { name: '', layers: [] }, parts, typical, {}, files);
    // wren_mc7.ibs [Model] dq_drv40: Vmeas 0.75, Rref 50, Cref 0, Vref 0.75 (the part's linear: 25 Ω to 0.6 V).
    expect(c.driver.refLoad).toEqual({ ohms: 50, vtt: 0.75, farads: 0 });
    expect(c.driver.vmeas).toBe(0.75);
    expect(c.driver.pad?.label).toBe('wren_mc7.ibs dq_drv40 typ');
  });

  it('maps project corners onto IBIS columns: slow/Tco max -> min, fast/Tco min -> max, else typ', () => {
    // docs/ibis.md §9: the standard's min column is the weak, slow data.
    expect(ibisColumnOf({ ...typical, name: 'slow', tco: 'max' })).toBe('min');
    expect(ibisColumnOf({ ...typical, name: 'Slow', tco: 'typ' })).toBe('min');
    expect(ibisColumnOf({ ...typical, name: 'fast', tco: 'min' })).toBe('max');
    expect(ibisColumnOf(typical)).toBe('typ');
    const slow = buildNetCircuit(net, { name: '', layers: [] }, parts, { ...typical, name: 'slow', tco: 'max', driverStrength: 1.3 }, {}, files);
    expect(slow.driver.pad?.label).toBe('wren_mc7.ibs dq_drv40 min');
    // Package at the min column: wren_mc7 [Package] L_pkg min 2.0 nH.
    expect(slow.elements).toContainEqual({ kind: 'inductor', a: 'pin~die#pkg', b: 'pin', henries: 2.0e-9 });
  });

  it('names the part and field when the file or model is missing', () => {
    expect(() => buildNetCircuit(net, { name: '', layers: [] }, parts, typical)).toThrow(/part MEM ibis\.file: IBIS file "heron_m4\.ibs" is not in the project/);
    const wrong = { ...parts[0], ibis: { file: 'wren_mc7.ibs', model: 'nope' } };
    expect(() => partIbis(wrong, files)).toThrow(/part CTL ibis\.model: unknown model name "nope"/);
  });

  it('gives the curves of a part\'s model at a corner\'s column for a view', () => {
    const c = partIbisCurves(parts[0], files, { ...typical, name: 'fast', tco: 'min' })!;
    // fast -> max column (docs/ibis.md §9); the label and column come back with the curves.
    expect(c.model).toBe('dq_drv40');
    expect(c.column).toBe('max');
    expect(c.pulldown!.v.length).toBeGreaterThan(2);
    expect(partIbisCurves({ ...parts[0], ibis: undefined }, files, typical)).toBeNull();
  });

  it('sits the part behind the package of the [Pin] it names, else the first pin using the model', () => {
    // wren_mc7.ibs [Pin]: A1 DQ0 dq_sel (the [Package]: typ R 0.25 Ω, L 2.4 nH, C 0.9 pF); A2 DQ1 dq_sel with
    // its own R_pin 0.21 Ω, L_pin 2.1 nH, C_pin 0.85 pF; dq_sel offers dq_drv40 (fixtures/ibis/generate.ts).
    const first = buildNetCircuit(net, { name: '', layers: [] }, parts, typical, {}, files);
    expect(first.elements).toContainEqual({ kind: 'inductor', a: 'pin~die#pkg', b: 'pin', henries: 2.4e-9 });
    const onA2 = [{ ...parts[0], ibis: { file: 'wren_mc7.ibs', model: 'dq_drv40', pin: 'A2' } }, parts[1]];
    const own = buildNetCircuit(net, { name: '', layers: [] }, onA2, typical, {}, files);
    expect(own.elements).toContainEqual({ kind: 'resistor', a: 'pin~die', b: 'pin~die#pkg', ohms: 0.21 });
    expect(own.elements).toContainEqual({ kind: 'inductor', a: 'pin~die#pkg', b: 'pin', henries: 2.1e-9 });
    expect(own.elements).toContainEqual({ kind: 'capacitor', a: 'pin', b: 'gnd', farads: 0.85e-12 });
  });

  it('refuses a pin that does not use the model, or is not in the file, naming the part\'s field', () => {
    const clockPin = { ...parts[0], ibis: { file: 'wren_mc7.ibs', model: 'dq_drv40', pin: 'A3' } };
    expect(() => partIbis(clockPin, files)).toThrow(/part CTL ibis\.pin: pin "A3" of wren_mc7\.ibs uses model "ck_ramp"/);
    const nowhere = { ...parts[0], ibis: { file: 'wren_mc7.ibs', model: 'dq_drv40', pin: 'Z9' } };
    expect(() => partIbis(nowhere, files)).toThrow(/part CTL ibis\.pin: no pin "Z9" .* \(pins using dq_drv40: A1, A2\)/);
  });
});

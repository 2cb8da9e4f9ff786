/**
 * A project part with an IBIS driver gives the same receiver waveform as the equivalent IBIS net file
 * run by `slackline sim --json` itself (docs/ibis.md §7, §9). Files: the invented fixtures/ibis models.
 */
import { copyFileSync, readFileSync, writeFileSync } from 'node:fs';
import { join } from 'node:path';
import { afterAll, describe, expect, it } from 'vitest';
import { main } from '../../../main/cli/index.js';
import { buildNetCircuit, ibisFileRecord } from '../../../core/netbuild/index.js';
import type { Corner, NetDefinition, PartModel } from '../../../core/project/model.js';
import { simulateNet } from '../../../core/solver/transient.js';
import { makeTempDir } from '../db/temp-files.js';

const DIR = new URL('../../../fixtures/ibis/', import.meta.url).pathname;
const tmp = makeTempDir('slackline-ibis-sim-');
afterAll(() => tmp.remove());

const parts: PartModel[] = [{
  name: 'CTL', description: 'controller DQ (invented)', ioStandard: '', receiver: null, ibis: { file: 'wren_mc7.ibs', model: 'dq_drv60' },
  driver: { vol: 0, voh: 1.5, routHigh: 60, routLow: 60, riseTime: 300e-12, fallTime: 300e-12, tcoMin: 0.4e-9, tcoMax: 1.1e-9, refLoad: { ohms: 50, vtt: 0.75, farads: 0 }, vmeas: 0.75 },
}, {
  name: 'RX', description: 'linear input (invented)', ioStandard: '', driver: null,
  receiver: { cin: 1e-12, vil: 0.65, vih: 0.85, vref: 0.75, odtOhms: null, odtVtt: 0.75, vmaxAbs: 1.9, vminAbs: -0.4, tsetup: 0.1e-9, thold: 0.1e-9 },
}];
const net: NetDefinition = {
  name: 'N', bus: 'B', role: 'data', driver: { part: 'CTL', node: 'pin', designator: 'U1' },
  receivers: [{ part: 'RX', node: 'rx', designator: 'U2' }], rails: {},
  elements: [{ kind: 'line', a: 'pin', b: 'rx', z0: 50, delay: 600e-12 }],
};
const typical: Corner = { name: 'typical', driverStrength: 1, edgeRate: 1, dk: 1, widthDelta: 0, rail: 1, cin: 1, tco: 'typ' };

describe('project IBIS driver against slackline sim', () => {
  it('gives the same receiver waveform as the net file through the sim command', async () => {
    const files = [ibisFileRecord('wren_mc7.ibs', readFileSync(join(DIR, 'wren_mc7.ibs'), 'utf8'))];
    const circuit = buildNetCircuit(net, { name: '', layers: [] }, parts, typical, {}, files);
    copyFileSync(join(DIR, 'wren_mc7.ibs'), tmp.file('wren_mc7.ibs'));
    // wren_mc7.ibs [Package] typ: R 0.25 Ω, L 2.4 nH, C 0.9 pF, written as the project builds them.
    writeFileSync(tmp.file('n.json'), JSON.stringify({
      version: 1,
      driver: { node: 'pin~die', ibis: { file: 'wren_mc7.ibs', model: 'dq_drv60' }, corner: 'typ' },
      elements: [
        { kind: 'line', a: 'pin', b: 'rx', z0: 50, delay: '600ps' },
        { kind: 'resistor', a: 'pin~die', b: 'pin~die#pkg', ohms: 0.25 },
        { kind: 'inductor', a: 'pin~die#pkg', b: 'pin', henries: 2.4e-9 },
        { kind: 'capacitor', a: 'pin', b: 'gnd', farads: 0.9e-12 },
      ],
      receivers: [{ node: 'rx', vil: 0.65, vih: 0.85, cin: 1e-12, vref: 0.75, vmaxAbs: 1.9, vminAbs: -0.4 }],
      stop: circuit.stop,
    }));
    let out = '';
    const status = await main(['sim', tmp.file('n.json'), '--json'], { out: (t) => void (out += t), err: () => undefined });
    expect(status).toBe(0);
    const sim = JSON.parse(out) as { waveforms: Record<'rising' | 'falling', { t: number[]; v: Record<string, number[]> }> };
    const own = simulateNet(circuit);
    for (const edge of ['rising', 'falling'] as const) {
      const a = own[edge].v[own[edge].nodes.indexOf('rx')];
      const b = sim.waveforms[edge].v.rx;
      expect(b.length).toBe(a.length);
      let worst = 0;
      for (let k = 0; k < a.length; k++) worst = Math.max(worst, Math.abs(a[k] - b[k]));
      // Same circuit and solver; only element order differs (floating-point summation order, far below 1 µV).
      expect(worst).toBeLessThan(1e-6);
      // It swings: wren_mc7 dq_drv60 rails 0 to 1.5 V typ (a flat line would pass the comparison).
      expect(Math.max(...a) - Math.min(...a)).toBeGreaterThan(1);
    }
  });
});

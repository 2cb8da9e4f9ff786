/**
 * IBIS nets against ngspice (Debian package, batch mode): the same buffers emulated with B-sources
 * (tests/ngspice/ibis-spice.ts), lossless T lines and the package as explicit elements where the net
 * writes it. Source of the reference: "ngspice run". Nets: fixtures/ibis/net-*.json (invented).
 *
 * Tolerances (the acceptance pinned in docs/ibis.md §8): the largest deviation at every node after
 * interpolating the solver onto ngspice's time points, at most 2 % of the rail swing (4 % for the
 * ramp-only model, whose K ramps have corners both programs step over differently); every first/last
 * VIL/VIH crossing at every receiver within 10 ps.
 */
import { readFileSync } from 'node:fs';
import { describe, expect, it } from 'vitest';
import { parseNetFile } from '../../core/circuit/parse.js';
import type { Circuit, IbisCorner } from '../../core/circuit/types.js';
import { attachIbisModels, ibisFilesOf } from '../../core/ibis/attach.js';
import { parseIbis } from '../../core/ibis/parse.js';
import { chooseStop, simulateEdge } from '../../core/solver/transient.js';
import { firstCrossing, lastCrossing, valueAt } from '../../core/measure/crossings.js';
import { runIbisNgspice } from './ibis-spice.js';

/** ngspice TMAX, s: as the linear comparison (tests/ngspice/compare.test.ts). */
const TMAX = 1e-12;

function load(name: string, corner?: IbisCorner): Circuit {
  const url = (f: string) => new URL(`../../fixtures/ibis/${f}`, import.meta.url);
  const json = JSON.parse(readFileSync(url(name), 'utf8'));
  if (corner) json.driver.corner = corner;
  const circuit = parseNetFile(json, name);
  const files = new Map(ibisFilesOf(circuit).map((f) => [f, parseIbis(readFileSync(url(f), 'utf8'), f)]));
  return attachIbisModels(circuit, files, name);
}

const NETS: { name: string; corner?: IbisCorner; tolerance: number; why: string }[] = [
  { name: 'net-p2p-clamp.json', tolerance: 0.02, why: 'point-to-point, POWER clamp shapes the overshoot' },
  { name: 'net-series.json', tolerance: 0.02, why: 'series-terminated, package written as elements' },
  { name: 'net-flyby.json', tolerance: 0.02, why: 'fly-by, three IBIS receivers, VTT end' },
  { name: 'net-p2p-clamp.json', corner: 'min', tolerance: 0.02, why: 'min corner' },
  { name: 'net-series.json', corner: 'max', tolerance: 0.02, why: 'max corner' },
  { name: 'net-ramp-only.json', tolerance: 0.04, why: 'ramp-only driver' },
  { name: 'net-coupled-inputs.json', tolerance: 0.02, why: 'two IBIS inputs coupled by a resistor, one-waveform driver' },
];

describe('IBIS nets match ngspice B-source emulations', () => {
  for (const net of NETS) {
    for (const edge of ['rising', 'falling'] as const) {
      it(`${net.name} ${net.corner ?? 'typ'} (${net.why}), ${edge}`, () => {
        const circuit = load(net.name, net.corner);
        const stop = circuit.stop ?? chooseStop(circuit);
        const mine = simulateEdge(circuit, edge, { stop });
        const ref = runIbisNgspice(circuit, edge, { stop, tmax: TMAX });
        const swing = circuit.driver.vhigh - circuit.driver.vlow;
        let worst = 0;
        for (const [i, node] of mine.nodes.entries()) {
          const spice = ref.v[node];
          expect(spice, `ngspice output has node ${node}`).toBeDefined();
          for (let k = 0; k < ref.t.length; k++) worst = Math.max(worst, Math.abs(valueAt(mine.t, mine.v[i], ref.t[k]) - spice[k]));
        }
        if (process.env.IBIS_PRINT) console.log(`${net.name} ${net.corner ?? "typ"} ${edge}: worst ${(100 * worst / swing).toFixed(3)} % of swing`);
        expect(worst / swing).toBeLessThanOrEqual(net.tolerance);
        const dir = edge === 'rising' ? 'up' : 'down';
        let crossings = 0;
        for (const r of circuit.receivers) {
          const v = mine.v[mine.nodes.indexOf(r.node)];
          const s = ref.v[r.node];
          for (const level of [r.vil, r.vih]) {
            for (const find of [firstCrossing, lastCrossing]) {
              const a = find(mine.t, v, level, dir);
              const b = find(ref.t, s, level, dir);
              expect(a === null, `${r.node} crosses ${level} V in both or neither`).toBe(b === null);
              if (a !== null && b !== null) {
                expect(Math.abs(a - b), `${r.node} ${level} V`).toBeLessThanOrEqual(10e-12);
                crossings++;
              }
            }
          }
        }
        expect(crossings).toBeGreaterThan(0);
      }, 240_000);
    }
  }
});

/**
 * `slackline sim` on net files with IBIS drivers and receivers (docs/ibis.md §7): the .ibs files are
 * read relative to the net file, the JSON output has the same shape as for a linear driver, and a
 * malformed or missing .ibs file exits 2 naming file, line and keyword. Nets and models:
 * fixtures/ibis/ (invented, provenance in its README).
 */
import { afterAll, describe, expect, it } from 'vitest';
import { copyFileSync, mkdtempSync, readFileSync, rmSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { main } from '../../main/cli/index.js';

const fixture = (f: string) => new URL(`../../fixtures/ibis/${f}`, import.meta.url).pathname;
const dir = mkdtempSync(join(tmpdir(), 'slackline-sim-ibis-'));
afterAll(() => rmSync(dir, { recursive: true, force: true }));

async function sim(...args: string[]) {
  let out = '';
  let err = '';
  const status = await main(['sim', ...args], { out: (t) => void (out += `${t}\n`), err: (t) => void (err += `${t}\n`) });
  return { status, out, err };
}

describe('slackline sim with IBIS models', () => {
  it('simulates the fly-by net with the contract JSON of a linear net', async () => {
    const ibis = JSON.parse((await sim(fixture('net-flyby.json'), '--json')).out);
    const linear = JSON.parse((await sim(new URL('../../fixtures/nets/series-term.json', import.meta.url).pathname, '--json')).out);
    expect(Object.keys(ibis)).toEqual(Object.keys(linear));
    expect(Object.keys(ibis.receivers[0].rising).sort()).toEqual(Object.keys(linear.receivers[0].rising).sort());
    expect(ibis.receivers.map((r: { node: string }) => r.node)).toEqual(['rx1', 'rx2', 'rx3']);
    // Final level of the rising edge: the pull-up (rail 1.5 V) against 40 ohm to VTT = 0.75 V, between
    // the two (Kirchhoff's law; the exact value depends on the invented V-I curve).
    const final = ibis.receivers[0].rising.vFinal;
    expect(final).toBeGreaterThan(0.75);
    expect(final).toBeLessThan(1.5);
    expect(JSON.stringify(ibis)).not.toMatch(/NaN/);
  });

  it('names the models in the text summary', async () => {
    const r = await sim(fixture('net-ramp-only.json'));
    expect(r.status).toBe(0);
    expect(r.out).toMatch(/IBIS models: wren_mc7\.ibs ck_ramp typ; heron_m4\.ibs dq_in typ/);
  });

  it('exits 2 naming the .ibs file, line and keyword when a referenced file is malformed', async () => {
    for (const f of ['net-series.json', 'wren_mc7.ibs']) copyFileSync(fixture(f), join(dir, f));
    const text = readFileSync(fixture('heron_m4.ibs'), 'utf8').replace('[GND Clamp]\n| voltage   I(typ)        I(min)        I(max)\n', '[GND Clamp]\n| voltage   I(typ)        I(min)        I(max)\n  -1.5000  NA  NA  NA\n');
    writeFileSync(join(dir, 'heron_m4.ibs'), text);
    const r = await sim(join(dir, 'net-series.json'));
    expect(r.status).toBe(2);
    expect(r.err).toMatch(/heron_m4\.ibs line \d+ \[GND Clamp\]: NA in the typ column/);
  });

  it('exits 2 when a referenced .ibs file is missing', async () => {
    const net = JSON.parse(readFileSync(fixture('net-series.json'), 'utf8'));
    net.driver.ibis.file = 'absent.ibs';
    writeFileSync(join(dir, 'absent-net.json'), JSON.stringify(net));
    const r = await sim(join(dir, 'absent-net.json'));
    expect(r.status).toBe(2);
    expect(r.err).toMatch(/absent\.ibs: IBIS file not found/);
  });
});

/**
 * `slackline sim NET.json [--json] [--csv FILE]` (docs/design.md §8.5). Net: fixtures/nets/series-term.json
 * (invented). Expected launch level: V+ = Vs·Z0/(Z0+Zs) (docs/design.md §2, lossless line theory).
 */
import { afterAll, describe, expect, it } from 'vitest';
import { mkdtempSync, readFileSync, rmSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { main } from '../../main/cli/index.js';

const net = new URL('../../fixtures/nets/series-term.json', import.meta.url).pathname;
const dir = mkdtempSync(join(tmpdir(), 'slackline-sim-cli-'));
afterAll(() => rmSync(dir, { recursive: true, force: true }));

async function sim(...args: string[]) {
  let out = '';
  let err = '';
  const status = await main(['sim', ...args], { out: (t) => void (out += `${t}\n`), err: (t) => void (err += `${t}\n`) });
  return { status, out, err };
}

describe('slackline sim', () => {
  it('prints the measurements and waveforms of the contract with --json', async () => {
    const r = await sim(net, '--json');
    expect(r.status).toBe(0);
    const answer = JSON.parse(r.out);
    const rx = answer.receivers[0];
    expect(rx.node).toBe('rx');
    for (const key of ['vLaunch', 'vFirstIncidence', 'firstIncidence', 'vmax', 'vmin', 'tFirstVil', 'tFirstVih', 'tLastVih', 'ringbackMargin', 'overshoot', 'undershoot', 'settlingTime']) {
      expect(rx.rising, key).toHaveProperty(key);
    }
    expect(rx.falling).toHaveProperty('tLastVil');
    // The driver pin (before the 33 Ω series resistor) first sees 33 Ω + Z0 = 85 Ω behind Rout = 15 Ω:
    // 3.3·85/100 = 2.805 V; the wave launched on the line is V+ = 3.3·52/100 = 1.716 V (lossless line theory).
    expect(rx.rising.vLaunch).toBeCloseTo(2.805, 2);
    expect(rx.rising.firstIncidence).toBe(true);
    const wave = answer.waveforms.rising;
    expect(wave.t.length).toBe(wave.v.rx.length);
    expect(JSON.stringify(answer)).not.toMatch(/NaN/);
  });

  it('writes the waveforms as CSV with --csv', async () => {
    const csv = join(dir, 'wave.csv');
    const r = await sim(net, '--csv', csv);
    expect(r.status).toBe(0);
    expect(r.out).toMatch(/receiver rx/);
    const [header, first] = readFileSync(csv, 'utf8').split('\n');
    expect(header).toMatch(/rx/);
    expect(first.split(',').length).toBe(header.split(',').length);
  });

  it('refuses a line with z0 <= 0, naming the element, with exit status 2', async () => {
    const bad = JSON.parse(readFileSync(net, 'utf8'));
    bad.elements[1].z0 = 0;
    const file = join(dir, 'bad.json');
    writeFileSync(file, JSON.stringify(bad));
    const r = await sim(file, '--json');
    expect(r.status).toBe(2);
    expect(r.err).toMatch(/elements\[1\]/);
    expect(r.err).toMatch(/z0/);
  });
});

describe('slackline sim output limits', () => {
  it('refuses --json for a run too long to print, before simulating, and points to --csv', async () => {
    // series-term with a 0.2 ms stop: millions of samples per edge (the solver's step rule), far past
    // the JSON limit; before, the JSON string itself ran out of memory (RangeError).
    const long = join(dir, 'long.json');
    writeFileSync(long, JSON.stringify({ ...JSON.parse(readFileSync(net, 'utf8')), stop: 2e-4 }));
    const r = await sim(long, '--json');
    expect(r.status).toBe(2);
    expect(r.err).toMatch(/--json: the waveforms would be about .* numbers \(limit 2000000.*--csv FILE \(streamed\)/);
    expect(r.out).toBe('');
  });

  it('streams the CSV: every sample of both edges is a row, the header names each node', async () => {
    const csv = join(dir, 'all.csv');
    const j = await sim(net, '--json');
    const waves = JSON.parse(j.out).waveforms as Record<string, { t: number[] }>;
    expect((await sim(net, '--csv', csv)).status).toBe(0);
    const rows = readFileSync(csv, 'utf8').trimEnd().split('\n');
    // One header plus one row per sample of each edge (hand count: the JSON's time axes).
    expect(rows.length).toBe(1 + waves.rising.t.length + waves.falling.t.length);
  });

  it('names the file when the CSV cannot be written', async () => {
    const r = await sim(net, '--csv', join(dir, 'no-such-folder', 'w.csv'));
    expect(r.status).toBe(2);
    expect(r.err).toMatch(/--csv .*no-such-folder.*cannot write the file \(ENOENT\)/);
  });
});

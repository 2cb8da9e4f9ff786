/**
 * `slackline ibis FILE.ibs [--json]` on the invented fixture (fixtures/ibis/wren_mc7.ibs, provenance in
 * its README) and on a malformed copy: exit 2 with file, line and keyword.
 */
import { afterAll, describe, expect, it } from 'vitest';
import { mkdtempSync, readFileSync, rmSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { main } from '../../main/cli/index.js';

const file = new URL('../../fixtures/ibis/wren_mc7.ibs', import.meta.url).pathname;
const dir = mkdtempSync(join(tmpdir(), 'slackline-ibis-cli-'));
afterAll(() => rmSync(dir, { recursive: true, force: true }));

async function ibis(...args: string[]) {
  let out = '';
  let err = '';
  const status = await main(['ibis', ...args], { out: (t) => void (out += `${t}\n`), err: (t) => void (err += `${t}\n`) });
  return { status, out, err };
}

describe('slackline ibis', () => {
  it('lists components, pins, models and the end-point check', async () => {
    const r = await ibis(file);
    expect(r.status).toBe(0);
    expect(r.out).toMatch(/component WREN_MC7/);
    expect(r.out).toMatch(/model dq_drv40 \(line 25\): I\/O/);
    expect(r.out).toMatch(/C_comp 2\.00 pF \/ 1\.80 pF \/ 2\.20 pF/);
    // The ramp-only model says it has no waveform tables (docs/ibis.md §4, ramp-only rule).
    expect(r.out).toMatch(/model ck_ramp[\s\S]*no waveform tables/);
  });

  it('prints JSON with the mismatch of every waveform end point', async () => {
    const r = await ibis(file, '--json');
    expect(r.status).toBe(0);
    const s = JSON.parse(r.out);
    const dq = s.models.find((m: { name: string }) => m.name === 'dq_drv40');
    expect(dq.cComp).toEqual({ typ: 2e-12, min: 1.8e-12, max: 2.2e-12 });
    expect(dq.switching).toEqual({ rising: 'two-waveform', falling: 'two-waveform' });
    expect(dq.endPoints.length).toBe(12); // 4 waveforms x 3 corners
    // The generator wrote the tables from the V-I data, so the end points agree to the table's
    // 5-decimal rounding (10 uV of 1.5 V < 0.01 %).
    for (const e of dq.endPoints) expect(e.mismatchPercent).toBeLessThan(0.01);
  });

  it('refuses a malformed table with exit status 2, naming file, line and keyword', async () => {
    const lines = readFileSync(file, 'utf8').split('\n');
    const row = lines.findIndex((l) => l.startsWith('[Pulldown]')) + 3; // second data row (after the header comment)
    lines[row] = lines[row].split(/\s+/).filter(Boolean).slice(0, 3).join('  ');
    const bad = join(dir, 'bad.ibs');
    writeFileSync(bad, lines.join('\n'));
    const r = await ibis(bad);
    expect(r.status).toBe(2);
    expect(r.err).toContain(`${bad} line ${row + 1} [Pulldown]`);
    expect(r.err).toMatch(/expected 4 columns/);
  });

  it('refuses a missing file with exit status 2', async () => {
    const r = await ibis(join(dir, 'none.ibs'));
    expect(r.status).toBe(2);
    expect(r.err).toMatch(/file not found/);
  });
});

import { mkdtempSync, rmSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { afterAll, describe, expect, it } from 'vitest';
import { main } from '../../main/cli/index.js';
import type { CliIo } from '../../main/cli/command.js';
import { cohnStriplineZ0 } from '../../core/stackup/index.js';

function capture(): CliIo & { stdout: string; stderr: string } {
  const io = {
    stdout: '',
    stderr: '',
    out(text: string) { io.stdout += `${text}\n`; },
    err(text: string) { io.stderr += `${text}\n`; },
  };
  return io;
}

async function run(...argv: string[]): Promise<{ code: number; stdout: string; stderr: string }> {
  const io = capture();
  const code = await main(argv, io);
  return { code, stdout: io.stdout, stderr: io.stderr };
}

const microstrip = ['z0', '--kind', 'microstrip', '--width', '8mil', '--thickness', '1.4mil', '--below', '4.5mil', '--er', '4.2'];

describe('slackline z0', () => {
  it('prints the JSON contract in SI units', async () => {
    // Contract of issue 2: z0, epsEff, velocity, delayPerMetre, inductancePerMetre, capacitancePerMetre.
    const r = await run(...microstrip, '--json');
    expect(r.code).toBe(0);
    const j = JSON.parse(r.stdout);
    for (const key of ['z0', 'epsEff', 'velocity', 'delayPerMetre', 'inductancePerMetre', 'capacitancePerMetre']) {
      expect(typeof j[key]).toBe('number');
    }
    expect(j.z0).toBeGreaterThan(40);
    expect(j.z0).toBeLessThan(60);
    // Identity Z0 = sqrt(L/C) (telegrapher's equations).
    expect(Math.sqrt(j.inductancePerMetre / j.capacitancePerMetre)).toBeCloseTo(j.z0, 9);
  });

  it('adds Zodd, Zeven, Zdiff, Zcommon with --spacing', async () => {
    // Contract of issue 2; definitions Zdiff = 2·Zodd, Zcommon = Zeven/2.
    const r = await run(...microstrip, '--spacing', '6mil', '--json');
    expect(r.code).toBe(0);
    const j = JSON.parse(r.stdout);
    expect(j.zdiff).toBeCloseTo(2 * j.zodd, 12);
    expect(j.zcommon).toBeCloseTo(j.zeven / 2, 12);
    expect(j.notes).toEqual([]);
  });

  it('accepts mm and metres and gives the Cohn result for a zero-thickness stripline', async () => {
    // Cohn 1954 exact via --model cohn-zero-thickness; b = 2·0.15 mm.
    const r = await run('z0', '--kind', 'stripline', '--width', '0.1mm', '--thickness', '0', '--below', '1.5e-4',
      '--er', '4', '--model', 'cohn-zero-thickness', '--json');
    expect(r.code).toBe(0);
    expect(JSON.parse(r.stdout).z0).toBeCloseTo(cohnStriplineZ0(1e-4, 3e-4, 4), 10);
  });

  it('handles offset stripline and embedded microstrip', async () => {
    // Contract of issue 2: every --kind is accepted; structure echoed back.
    const a = await run('z0', '--kind', 'offset-stripline', '--width', '5mil', '--thickness', '0.6mil', '--below', '12mil', '--above', '4mil', '--er', '4', '--json');
    expect(a.code).toBe(0);
    expect(JSON.parse(a.stdout).structure).toBe('offset-stripline');
    const b = await run('z0', '--kind', 'embedded-microstrip', '--width', '8mil', '--thickness', '1.4mil', '--below', '4.5mil', '--cover', '3mil', '--er', '4.2');
    expect(b.code).toBe(0);
    expect(b.stdout).toMatch(/embedded-microstrip/);
  });

  it('prints a readable summary in engineering units', async () => {
    // Brief: readable summary in engineering units (Ω, ps/in, ps/mm, pF/in, nH/in) and the authority statement.
    const r = await run(...microstrip, '--spacing', '6mil');
    expect(r.code).toBe(0);
    for (const unit of [/Ω/, /ps\/in/, /ps\/mm/, /pF\/in/, /nH\/in/, /Zdiff/, /authority/]) expect(r.stdout).toMatch(unit);
  });

  const bad: [string, string[], RegExp][] = [
    ['missing --kind', ['z0', '--width', '5mil', '--thickness', '1mil', '--below', '4mil', '--er', '4'], /--kind: is required/],
    ['unknown --kind', [...microstrip.slice(0, 1), '--kind', 'coax', ...microstrip.slice(3)], /--kind: unknown kind "coax"/],
    ['missing --width', ['z0', '--kind', 'microstrip', '--thickness', '1mil', '--below', '4mil', '--er', '4'], /--width: is required/],
    ['bad unit --width', ['z0', '--kind', 'microstrip', '--width', '5furlong', '--thickness', '1mil', '--below', '4mil', '--er', '4'], /--width: unknown length unit/],
    ['zero --width', ['z0', '--kind', 'microstrip', '--width', '0mil', '--thickness', '1mil', '--below', '4mil', '--er', '4'], /--width: .*greater than/],
    ['no number --width', ['z0', '--kind', 'microstrip', '--width', 'mil', '--thickness', '1mil', '--below', '4mil', '--er', '4'], /--width: expected a number/],
    ['missing --thickness', ['z0', '--kind', 'microstrip', '--width', '5mil', '--below', '4mil', '--er', '4'], /--thickness: is required/],
    ['negative --thickness', ['z0', '--kind', 'microstrip', '--width', '5mil', '--thickness=-1mil', '--below', '4mil', '--er', '4'], /--thickness: .*at least/],
    ['negative value without =', ['z0', '--kind', 'microstrip', '--width', '5mil', '--thickness', '-1mil', '--below', '4mil', '--er', '4'], /'--thickness' argument is ambiguous/],
    ['missing --below', ['z0', '--kind', 'microstrip', '--width', '5mil', '--thickness', '1mil', '--er', '4'], /--below: is required/],
    ['bad --below', ['z0', '--kind', 'microstrip', '--width', '5mil', '--thickness', '1mil', '--below', '4ps', '--er', '4'], /--below: unknown length unit/],
    ['missing --er', ['z0', '--kind', 'microstrip', '--width', '5mil', '--thickness', '1mil', '--below', '4mil'], /--er: is required/],
    ['--er below 1', [...microstrip.slice(0, -1), '0.8'], /--er: .*at least 1/],
    ['--er not a number', [...microstrip.slice(0, -1), 'four'], /--er: expected a number/],
    ['--above on microstrip', [...microstrip, '--above', '4mil'], /--above: applies only to stripline/],
    ['--above missing on offset', ['z0', '--kind', 'offset-stripline', '--width', '5mil', '--thickness', '1mil', '--below', '4mil', '--er', '4'], /--above: is required/],
    ['--above unequal on stripline', ['z0', '--kind', 'stripline', '--width', '5mil', '--thickness', '1mil', '--below', '4mil', '--above', '8mil', '--er', '4'], /--above: differs/],
    ['bad --above', ['z0', '--kind', 'offset-stripline', '--width', '5mil', '--thickness', '1mil', '--below', '4mil', '--above=-2mil', '--er', '4'], /--above: .*greater than/],
    ['--cover missing on embedded', ['z0', '--kind', 'embedded-microstrip', '--width', '5mil', '--thickness', '1mil', '--below', '4mil', '--er', '4'], /--cover: is required/],
    ['--cover on stripline', ['z0', '--kind', 'stripline', '--width', '5mil', '--thickness', '1mil', '--below', '4mil', '--cover', '2mil', '--er', '4'], /--cover: applies only/],
    ['bad --cover', ['z0', '--kind', 'embedded-microstrip', '--width', '5mil', '--thickness', '1mil', '--below', '4mil', '--cover', '0', '--er', '4'], /--cover: .*greater than/],
    ['bad unit --cover', ['z0', '--kind', 'embedded-microstrip', '--width', '5mil', '--thickness', '1mil', '--below', '4mil', '--cover', '2pF', '--er', '4'], /--cover: unknown length unit/],
    ['bad --spacing', [...microstrip, '--spacing', '0mil'], /--spacing: .*greater than/],
    ['--spacing on offset stripline', ['z0', '--kind', 'offset-stripline', '--width', '5mil', '--thickness', '1mil', '--below', '4mil', '--above', '9mil', '--er', '4', '--spacing', '5mil'], /--spacing: edge-coupled pairs/],
    ['unknown --model', [...microstrip, '--model', 'magic'], /--model: unknown model/],
    ['unknown flag', [...microstrip, '--colour', 'red'], /Unknown option '--colour'/],
    ['stray positional', [...microstrip, 'extra'], /argument "extra"/],
  ];
  for (const [what, argv, message] of bad) {
    it(`exits 2 naming the flag: ${what}`, async () => {
      // Quality bar: bad input exits 2 with a message naming the flag.
      const r = await run(...argv);
      expect(r.code).toBe(2);
      expect(r.stderr).toMatch(message);
      expect(r.stdout).toBe('');
    });
  }
});

describe('slackline stackup', () => {
  const dir = mkdtempSync(join(tmpdir(), 'slackline-stackup-'));
  afterAll(() => rmSync(dir, { recursive: true, force: true }));

  it('prints every routing layer with class, Z0 and delay', async () => {
    // Contract of issue 2: every routing layer with class, Z0 and delay/length (invented fixture).
    const r = await run('stackup', 'fixtures/stackups/six-layer-dual-stripline.json');
    expect(r.code).toBe(0);
    for (const text of ['L1', 'L3', 'L4', 'L6', 'microstrip', 'offset-stripline', 'ps/in', 'Ω']) expect(r.stdout).toContain(text);
  });

  it('prints SI JSON with --json', async () => {
    // Contract: --json in SI units (DESIGN.md §8).
    const r = await run('stackup', 'fixtures/stackups/four-layer-covered.json', '--json');
    expect(r.code).toBe(0);
    const j = JSON.parse(r.stdout);
    expect(j.layers.map((l: { structure: string }) => l.structure)).toEqual(['embedded-microstrip', 'stripline']);
    expect(j.layers[1].width).toBeCloseTo(0.12e-3, 15);
    // Stripline delay is sqrt(Dk)/c = sqrt(4)/c (TEM in a homogeneous dielectric).
    expect(j.layers[1].delayPerMetre).toBeCloseTo(2 / 299_792_458, 18);
  });

  it('exits 2 naming the file, line and column of bad JSON', async () => {
    // DESIGN.md §8: a bad file gets a message naming file, line and column.
    const file = join(dir, 'broken.json');
    writeFileSync(file, '{\n  "name": "x",\n  "layers": [,]\n}\n');
    const r = await run('stackup', file);
    expect(r.code).toBe(2);
    expect(r.stderr).toMatch(/broken.json line 3 column \d+: not valid JSON/);
  });

  it('exits 2 naming the layer and field of a bad value', async () => {
    // Quality bar: the message names the layer and field.
    const file = join(dir, 'bad-dk.json');
    writeFileSync(file, JSON.stringify({ name: 'x', layers: [
      { name: 'S', kind: 'copper', role: 'signal', thickness: '1mil', defaultWidth: '5mil' },
      { name: 'pp', kind: 'dielectric', thickness: '4mil', dk: 0.7 },
      { name: 'P', kind: 'copper', role: 'plane', thickness: '1mil' },
    ] }));
    const r = await run('stackup', file);
    expect(r.code).toBe(2);
    expect(r.stderr).toMatch(/bad-dk.json layers\[1\] \("pp"\) dk/);
  });

  it('exits 2 for a missing file, a missing argument and a layer without default width', async () => {
    // Quality bar: every error path exits 2 naming where.
    expect((await run('stackup', join(dir, 'nope.json'))).stderr).toMatch(/nope.json: file not found/);
    const none = await run('stackup');
    expect(none.code).toBe(2);
    expect(none.stderr).toMatch(/FILE.json: is required/);
    const file = join(dir, 'nowidth.json');
    writeFileSync(file, JSON.stringify({ name: 'x', layers: [
      { name: 'S', kind: 'copper', role: 'signal', thickness: '1mil' },
      { name: 'pp', kind: 'dielectric', thickness: '4mil', dk: 4 },
      { name: 'P', kind: 'copper', role: 'plane', thickness: '1mil' },
    ] }));
    const r = await run('stackup', file);
    expect(r.code).toBe(2);
    expect(r.stderr).toMatch(/layer "S" defaultWidth/);
  });
});

describe('slackline z0 inverse (--target-z0, --target-zdiff)', () => {
  const section = ['--thickness', '1.4mil', '--below', '4.5mil', '--er', '4.2'];

  it('solves the width for a target Z0, and that width gives the target back to 0.01 Ω', async () => {
    // Issue 2: the inverse round-trips to 0.01 Ω.
    const solved = await run('z0', '--kind', 'microstrip', '--target-z0', '50', ...section, '--json');
    expect(solved.code).toBe(0);
    const width = JSON.parse(solved.stdout).width as number;
    const again = await run('z0', '--kind', 'microstrip', '--width', String(width), ...section, '--json');
    expect(Math.abs(JSON.parse(again.stdout).z0 - 50)).toBeLessThan(0.01);
  });

  it('solves the spacing for a target Zdiff of a stripline pair', async () => {
    const r = await run('z0', '--kind', 'stripline', '--width', '4mil', '--thickness', '0.6mil', '--below', '5mil', '--above', '5mil',
      '--er', '4', '--target-zdiff', '90ohm', '--json');
    expect(r.code).toBe(0);
    const j = JSON.parse(r.stdout);
    expect(Math.abs(j.zdiff - 90)).toBeLessThan(0.01); // issue 2: round trip to 0.01 Ω
    expect(j.spacing).toBeGreaterThan(0);
  });

  it('refuses --width together with --target-z0, naming the flag', async () => {
    const r = await run('z0', '--kind', 'microstrip', '--width', '5mil', '--target-z0', '50', ...section);
    expect(r.code).toBe(2);
    expect(r.stderr).toContain('--width');
  });

  it('refuses a target that is not a positive impedance', async () => {
    const r = await run('z0', '--kind', 'microstrip', '--target-z0', '-5', ...section);
    expect(r.code).toBe(2);
    expect(r.stderr).toContain('--target-z0');
  });
});

import { afterEach, beforeEach, describe, expect, it } from 'vitest';
import { main } from '../../../main/cli/index.js';
import { ProjectStore } from '../../../main/services/project/project-store.js';
import { buildDemoProject } from '../../../fixtures/demo/demo-project.js';
import { viewNet } from '../../../core/netbuild/project-view.js';
import type { NetDefinition } from '../../../core/project/model.js';
import { expectSoundProject, fileHash, makeTempDir } from './temp-files.js';

async function cli(...argv: string[]): Promise<{ status: number; out: string; err: string }> {
  let out = '';
  let err = '';
  const status = await main(argv, { out: (t) => (out += `${t}\n`), err: (t) => (err += `${t}\n`) });
  return { status, out, err };
}

describe('slackline new / demo / show', () => {
  let temp: ReturnType<typeof makeTempDir>;
  beforeEach(() => {
    temp = makeTempDir('slackline-cli-');
  });
  afterEach(() => temp.remove());

  it('new creates an empty project named after the file and refuses to overwrite it', async () => {
    const path = temp.file('board-7.slackline');
    const created = await cli('new', path);
    expect(created).toMatchObject({ status: 0, out: `Created project "board-7" in ${path}\n` });
    const store = ProjectStore.open(path);
    const data = store.load();
    expect(data.info.name).toBe('board-7');
    expect(data.nets).toEqual([]);
    expect(data.corners.map((c) => c.name)).toEqual(['slow', 'typical', 'fast']);
    expect(store.integrityCheck()).toBe('ok');
    store.close();

    const nowhere = await cli('new', temp.file('no/such/folder/p.slackline'));
    expect(nowhere.status).toBe(2);
    expect(nowhere.err).toMatch(/p\.slackline: the folder .*no\/such\/folder does not exist/);

    const hash = fileHash(path);
    const again = await cli('new', path, '--name', 'other');
    expect(again.status).toBe(2);
    expect(again.err).toContain('board-7.slackline: a file of that name already exists');
    expect(fileHash(path)).toBe(hash);
  });

  it('demo --out DIR creates the demo project; show prints layers with Z0 and nets with lengths', async () => {
    const made = await cli('demo', '--out', temp.dir, '--no-report', '--json');
    expect(made.status).toBe(0);
    const { path, nets } = JSON.parse(made.out) as { path: string; nets: number };
    expect(path).toBe(temp.file('demo.slackline'));
    expect(nets).toBe(buildDemoProject().nets.length);

    const shown = await cli('show', path);
    expect(shown.status).toBe(0);
    // Format check; the masked outer layer is field-solved at about 48 Ω (docs/field-solver.md §10).
    expect(shown.out).toMatch(/L1_TOP\s+microstrip\s+Z0 \d\d\.\d Ω, eps_eff \d\.\d\d, \d\.\d\d ps\/mm/);
    expect(shown.out).toMatch(/L3_SIG\s+stripline\s+Z0 \d\d\.\d Ω/);
    // DQ45: 3 + 110 + 2 mm = 115 mm routed (fixtures/demo/demo-project.ts).
    expect(shown.out).toMatch(/DQ45\s+data\s+115\.000 mm\s+\d+ ps\s+L1_TOP 3\.000 mm \d\d\.\d Ω, L3_SIG 110\.000 mm/);
    expect(shown.out).toContain('BYTE0: source-synchronous, reference DQS0, valid before 225 ps, after 230 ps');
    expect(shown.out).toContain('ADDR_CMD: common-clock, reference CK0, cycle 2500 ps');
    // The demo's strobes are differential pairs: each segment shows the leg's odd-mode Zodd and the pair's
    // gap and Zdiff = 2·Zodd (demo data; docs/design.md §3): the demo sizes its L3 pairs to 95 Ω on the field
    // solution (fixtures/demo/README.md), shown to 0.1 Ω.
    expect(shown.out).toMatch(/DQS0\s+strobe\s+45\.000 mm.*L3_SIG 40\.000 mm \d\d\.\d Ω \(pair, gap 0\.181 mm, Zdiff 95\.0 Ω\)/);
    expect(shown.out).toContain('remain the authority');
    await expectSoundProject(path);
  });

  it('show --json gives the project and per-segment Z0 and delay in SI units', async () => {
    const path = temp.file('p.slackline');
    ProjectStore.create(path, buildDemoProject()).close();
    const shown = await cli('show', path, '--json');
    expect(shown.status).toBe(0);
    const json = JSON.parse(shown.out) as {
      data: ReturnType<typeof buildDemoProject>;
      view: { layers: { layer: string; delayPerMetre: number }[]; nets: { name: string; length: number; delay: number; segments: { z0: number; delay: number; length: number }[] }[] };
    };
    // show --json lists stored IBIS files by name, hash and length, without their text (docs/ibis.md §9)
    const expected = buildDemoProject();
    const listed = expected.ibisFiles!.map((f) => ({ name: f.name, sha256: f.sha256, characters: f.text.length }));
    expect(json.data).toStrictEqual({ ...expected, ibisFiles: listed });
    const dqs0 = json.view.nets.find((n) => n.name === 'DQS0')!;
    expect(dqs0.length).toBeCloseTo(45e-3, 12);
    // Delay of each segment = length x delay per metre of its layer (same width as the layer default).
    const perMetre = new Map(json.view.layers.map((l) => [l.layer, l.delayPerMetre]));
    // DQS0 is a pair: its leg travels at the field-solved odd-mode velocity, the layer row is the
    // single-ended closed form on the averaged Dk. Both see the 3.8/3.9 stripline dielectrics, so they
    // agree within 0.5 % (the Dk spread between the two slabs, 2.6 %, bounds the difference).
    expect(Math.abs(dqs0.segments[1].delay / (40e-3 * perMetre.get('L3_SIG')!) - 1)).toBeLessThan(0.005);
    expect(dqs0.delay).toBeCloseTo(dqs0.segments.reduce((s, x) => s + x.delay, 0), 18);
    // Fly-by A13: lead 4 + 30.9 mm, then 14 mm per device, 1.5 mm stubs (fixtures/demo/demo-project.ts).
    const a13 = json.view.nets.find((n) => n.name === 'A13') as unknown as { receivers: { length: number; delay: number }[]; delay: number };
    const expectedMm = [36.4, 50.4, 64.4, 78.4];
    a13.receivers.forEach((r, i) => expect(r.length).toBeCloseTo(expectedMm[i] * 1e-3, 12));
    expect(a13.delay).toBe(a13.receivers[3].delay);
    // Sanity range, docs/design.md §3: stripline in Dk ~4 about 170 ps/in = 6.7 ps/mm (common practice).
    expect(perMetre.get('L3_SIG')! * 1e9).toBeGreaterThan(6.0);
    expect(perMetre.get('L3_SIG')! * 1e9).toBeLessThan(7.0);
  });

  it('finds driver-to-receiver paths without crossing a rail', () => {
    const stackup = buildDemoProject().stackup;
    const net: NetDefinition = {
      name: 'T', bus: 'B', role: 'data', rails: { vtt: 0.6 },
      driver: { part: 'P', node: 'drv', designator: 'U1' },
      receivers: [{ part: 'P', node: 'r1', designator: 'U2' }, { part: 'P', node: 'r2', designator: 'U3' }],
      elements: [
        { kind: 'segment', a: 'drv', b: 'r1', layer: 'L3_SIG', width: 0.105e-3, length: 10e-3 },
        { kind: 'resistor', a: 'r1', b: 'vtt', ohms: 50 },
        // r2 hangs only on its own termination: reachable through vtt alone, so not connected.
        { kind: 'resistor', a: 'r2', b: 'vtt', ohms: 50 },
      ],
    };
    const view = viewNet(stackup, net);
    expect(view.receivers[0].length).toBe(10e-3);
    expect(view.receivers[1]).toMatchObject({ length: null, delay: null });
    expect(view.delay).toBeNull();
  });

  it('show refuses a file that is not a project with a clear message', async () => {
    const path = temp.file('notes.txt');
    await import('node:fs').then((fs) => fs.writeFileSync(path, 'hello'));
    const shown = await cli('show', path);
    expect(shown.status).toBe(2);
    expect(shown.err).toContain('notes.txt: is not a Slackline project (not an SQLite database at all)');
  });
});

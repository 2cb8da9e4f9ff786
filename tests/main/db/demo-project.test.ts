import { writeFileSync } from 'node:fs';
import { afterEach, beforeEach, describe, expect, it } from 'vitest';
import { buildDemoProject, DEMO_DELIBERATE_FAILURES, DEMO_DELIBERATE_TIGHT } from '../../../fixtures/demo/demo-project.js';
import { validateProject } from '../../../core/project/validate.js';
import { createDemoProject } from '../../../main/services/project/demo.js';
import { ProjectStore } from '../../../main/services/project/project-store.js';
import { layerProperties, pairOnLayer } from '../../../core/stackup/index.js';
import type { NetDefinition, NetElement } from '../../../core/project/model.js';
import { fileHash, listing, makeTempDir } from './temp-files.js';

const demo = buildDemoProject();
const net = (name: string): NetDefinition => demo.nets.find((n) => n.name === name)!;
const segments = (n: NetDefinition) => n.elements.filter((e): e is Extract<NetElement, { kind: 'segment' }> => e.kind === 'segment');
const routed = (n: NetDefinition) => segments(n).reduce((sum, s) => sum + s.length, 0);

describe('the demo project (invented for the demo)', () => {
  it('is a valid project of 100+ nets', () => {
    expect(() => validateProject(demo)).not.toThrow();
    expect(demo.nets.length).toBeGreaterThanOrEqual(100);
    expect(demo.info.description).toMatch(/Invented for the demo/);
  });

  it('has a stackup of at least 6 copper layers with outer microstrip and inner stripline near 50 ohm', () => {
    const copper = demo.stackup.layers.filter((l) => l.kind === 'copper');
    expect(copper.length).toBeGreaterThanOrEqual(6);
    expect(copper.filter((l) => l.role === 'plane').length).toBeGreaterThanOrEqual(3);
    const layers = layerProperties(demo.stackup);
    expect(layers.map((l) => l.structure)).toEqual(['microstrip', 'stripline', 'stripline', 'microstrip']);
    // Design intent of the invented stackup: about 50 ohm on every routing layer (+/-10 % is common practice, no source).
    for (const l of layers) expect(Math.abs(l.z0 - 50)).toBeLessThan(5);
  });

  it('has 8 byte lanes, each source-synchronous with 8 data nets and its strobe', () => {
    const lanes = demo.buses.filter((b) => b.name.startsWith('BYTE'));
    expect(lanes).toHaveLength(8);
    for (const lane of lanes) {
      expect(lane.kind).toBe('source-synchronous');
      const nets = demo.nets.filter((n) => n.bus === lane.name);
      expect(nets.filter((n) => n.role === 'data')).toHaveLength(8);
      expect(nets.filter((n) => n.role === 'strobe').map((n) => n.name)).toEqual([lane.referenceNet]);
    }
  });

  it('routes strobes and the clock as differential pairs of 95 ohm (field-solved), with leg thresholds', () => {
    const pairs = demo.nets.filter((n) => n.role === 'strobe' || (n.role === 'clock' && n.bus === 'ADDR_CMD'));
    expect(pairs.map((n) => n.name).sort()).toEqual(['CK0', ...Array.from({ length: 8 }, (_, i) => `DQS${i}`)].sort());
    for (const n of pairs) {
      for (const s of segments(n)) {
        expect(s.spacing, `${n.name} on ${s.layer}`).toBeGreaterThan(0);
        // Demo intent: Zdiff 95 Ω (fixtures/demo/README.md), sized with core/stackup/layer-inverse.ts on the
        // field solution of each layer's cross-section (docs/field-solver.md); Zdiff = 2·Zodd (docs/design.md §3).
        // 1 % band: the gaps are rounded to whole micrometres (common practice, no source).
        const zdiff = pairOnLayer(demo.stackup, s.layer, s.width, s.spacing!).zdiff;
        expect(Math.abs(zdiff - 95), `${n.name} on ${s.layer}: Zdiff ${zdiff}`).toBeLessThan(0.95);
      }
    }
    // Data and address stay single-ended.
    expect(demo.nets.filter((n) => !pairs.includes(n)).flatMap(segments).every((s) => s.spacing === undefined)).toBe(true);
    // Leg thresholds of a differential receiver: Vcm ± Vth,diff/2, since Vdiff = 2(Vleg − Vcm) in the odd mode
    // (even/odd decomposition, Cohn 1955). Demo values: Vcm 0.6 V, Vth,diff 150 mV (invented).
    for (const name of ['MEM-DQS', 'MEM-CK']) {
      const rx = demo.parts.find((p) => p.name === name)!.receiver!;
      expect(rx.vref).toBe(0.6);
      expect(rx.vih - rx.vref).toBeCloseTo(0.15 / 2, 12);
      expect(rx.vref - rx.vil).toBeCloseTo(0.15 / 2, 12);
    }
  });

  it('refuses a pair spacing that is not positive or sits on another element, naming the element', () => {
    const bad = buildDemoProject();
    const dqs = bad.nets.find((n) => n.name === 'DQS0')!;
    const first = dqs.elements[0];
    if (first.kind !== 'segment') throw new Error('DQS0 starts with a segment in the demo');
    dqs.elements[0] = { ...first, spacing: -1e-4 };
    expect(() => validateProject(bad)).toThrow(/element 1 \(segment\).*pair spacing/);
    dqs.elements[0] = first;
    dqs.elements[1] = { ...dqs.elements[1], spacing: 1e-4 } as NetElement; // a via with a gap: only JSON could say so
    expect(() => validateProject(bad)).toThrow(/element 2 \(via\).*pair spacing.*applies only to routed segments/);
  });

  it('routes address/command in fly-by past 4 devices with an end termination to VTT', () => {
    const bus = demo.buses.find((b) => b.name === 'ADDR_CMD')!;
    expect(bus.kind).toBe('common-clock');
    expect(net(bus.referenceNet!).role).toBe('clock');
    const nets = demo.nets.filter((n) => n.bus === 'ADDR_CMD');
    expect(nets.length).toBeGreaterThanOrEqual(20);
    for (const n of nets) {
      expect(n.receivers.map((r) => r.designator)).toEqual(['U10', 'U11', 'U12', 'U13']);
      // Stubs to the devices are short against the chain (1.5 mm vs 14 mm between devices).
      const stubs = segments(n).filter((s) => /^d\d$/.test(s.b));
      expect(stubs).toHaveLength(4);
      for (const stub of stubs) expect(stub.length).toBeLessThanOrEqual(2e-3);
      const termination = n.elements.find((e) => e.kind === 'resistor' && e.b === 'vtt');
      if (n.name === 'A13') expect(termination).toBeUndefined();
      else expect(termination).toMatchObject({ ohms: 39 });
      expect(n.rails).toEqual({ vtt: 0.6 });
    }
  });

  it('has a common-clock local bus with series termination at the driver', () => {
    const bus = demo.buses.find((b) => b.name === 'LOCAL')!;
    expect(bus.kind).toBe('common-clock');
    const nets = demo.nets.filter((n) => n.bus === 'LOCAL');
    expect(nets.length).toBeGreaterThanOrEqual(17);
    for (const n of nets) {
      const series = n.elements.find((e) => e.kind === 'resistor' && e.a === 'drv');
      if (n.name === 'LB_D7') expect(series).toBeUndefined();
      else expect(series).toMatchObject({ ohms: 22 });
    }
  });

  it('carries the deliberate faults it documents', () => {
    expect(Object.keys(DEMO_DELIBERATE_FAILURES).sort()).toEqual(['A13', 'DQ45', 'DQ58', 'LB_D7']);
    // DQ45: 40 mm longer than its strobe; the rest of its lane within 1.5 mm (the spread()).
    expect(routed(net('DQ45')) - routed(net('DQS5'))).toBeCloseTo(40e-3, 9);
    for (let bit = 40; bit < 48; bit += 1) {
      if (bit !== 45) expect(Math.abs(routed(net(`DQ${bit}`)) - routed(net('DQS5')))).toBeLessThanOrEqual(1.5e-3 + 1e-12);
    }
    // DQ58: shorter than DQS7 but routed mostly on an inner layer while its lane stays on top.
    expect(routed(net('DQ58'))).toBeLessThan(routed(net('DQS7')));
    expect(segments(net('DQS7')).map((s) => s.layer)).toEqual(['L1_TOP']);
    expect(segments(net('DQ58')).map((s) => s.layer)).toContain('L6_SIG');
    expect(routed(net('LB_D7'))).toBeGreaterThan(routed(net('LB_D6')) + 30e-3);
    expect(Object.keys(DEMO_DELIBERATE_TIGHT)).toEqual(['DQ12']);
    expect(routed(net('DQ12')) - routed(net('DQS1'))).toBeCloseTo(13e-3, 9);
  });

  it('has slow, typical and fast corners', () => {
    expect(demo.corners.map((c) => c.name)).toEqual(['slow', 'typical', 'fast']);
  });

  it('gives a fresh copy each call', () => {
    const a = buildDemoProject();
    a.nets[0].name = 'changed';
    expect(buildDemoProject().nets[0].name).toBe('DQS0');
  });
});

describe('createDemoProject', () => {
  let temp: ReturnType<typeof makeTempDir>;
  beforeEach(() => {
    temp = makeTempDir('slackline-demo-');
  });
  afterEach(() => temp.remove());

  it('writes DIR/demo.slackline, creating the folder, and replaces an earlier demo', () => {
    const dir = `${temp.dir}/nested/out`;
    const path = createDemoProject(dir);
    expect(path).toBe(`${dir}/demo.slackline`);
    const store = ProjectStore.open(path);
    store.updateInfo({ boardRevision: 'edited' });
    store.close();
    expect(createDemoProject(dir)).toBe(path);
    const again = ProjectStore.open(path);
    try {
      expect(again.load()).toStrictEqual(buildDemoProject());
      expect(again.integrityCheck()).toBe('ok');
    } finally {
      again.close();
    }
    expect(listing(dir)).toEqual(['demo.slackline']);
  });

  it('refuses to replace a file that is not a project', () => {
    const path = `${temp.dir}/demo.slackline`;
    writeFileSync(path, 'my notes');
    const hash = fileHash(path);
    expect(() => createDemoProject(temp.dir)).toThrow(/demo\.slackline: exists and is not a Slackline project/);
    expect(fileHash(path)).toBe(hash);
  });
});

/**
 * The results-cache key (core/hash): FNV-1a 64 against the published test vectors, and independence
 * from property order. Vectors: Fowler/Noll/Vo FNV test suite (IETF draft-eastlake-fnv, FNV-1a 64-bit),
 * "" -> cbf29ce484222325, "a" -> af63dc4c8601ec8c, "foobar" -> 85944171f73967e8.
 */
import { describe, expect, it } from 'vitest';
import { canonicalJson, fnv1a64, fnv1a64Bytes, hashOf } from '../../../core/hash/index.js';
import { keyInputs, netSimulationInputs, planBoard } from '../../../core/engine/board.js';
import type { ProjectData } from '../../../core/project/model.js';
import { buildDemoProject } from '../../../fixtures/demo/demo-project.js';

const bytes = (s: string) => Array.from(s, (c) => c.charCodeAt(0));

describe('FNV-1a 64', () => {
  it('matches the published test vectors', () => {
    expect(fnv1a64Bytes([])).toBe('cbf29ce484222325');
    expect(fnv1a64Bytes(bytes('a'))).toBe('af63dc4c8601ec8c');
    expect(fnv1a64Bytes(bytes('foobar'))).toBe('85944171f73967e8');
  });
  it('of a string is the byte hash of its UTF-16 code units, low byte first (definition in core/hash)', () => {
    for (const text of ['', 'a', 'foobar', 'Z0 = 50 Ω', '{"net":"DQ45","length":0.0312}', 'x'.repeat(1000) + '\u{1F50C}']) {
      const units = Array.from({ length: text.length }, (_, i) => text.charCodeAt(i)).flatMap((u) => [u & 0xff, u >>> 8]);
      expect(fnv1a64(text), text.slice(0, 20)).toBe(fnv1a64Bytes(units));
    }
  });
});

describe('hashOf (cache key of structured inputs; behaviour, no numeric source)', () => {
  it('ignores property order and sees every value change', () => {
    expect(hashOf({ a: 1, b: [1, 2, { c: 'x', d: 2 }] })).toBe(hashOf({ b: [1, 2, { d: 2, c: 'x' }], a: 1 }));
    expect(hashOf({ length: 0.0385 })).not.toBe(hashOf({ length: 0.0386 }));
    expect(hashOf([1, 2])).not.toBe(hashOf([2, 1]));
  });

  it('keeps non-finite numbers apart instead of collapsing them to null as JSON does', () => {
    expect(canonicalJson({ x: Infinity })).not.toBe(canonicalJson({ x: null }));
  });
});

describe('planBoard keys (docs/board-partitioning.md §2; behaviour, no numeric source)', () => {
  it('builds each net job\'s key from the bus and the simulation inputs by their hashes', () => {
    const project = buildDemoProject();
    const salt = 'salt for the test';
    const plan = planBoard(project, { salt });
    const inputs = keyInputs(project);
    const own = (name: string) => hashOf(netSimulationInputs(project, project.nets.find((n) => n.name === name)!, inputs));
    for (const job of plan.nets) {
      const net = project.nets.find((n) => n.name === job.net)!;
      const bus = hashOf(project.buses.find((b) => b.name === net.bus)!);
      const key = hashOf({ salt, guardBand: project.info.guardBand, job: 'net', bus, own: own(net.name), strobe: job.strobe ? own(job.strobe) : null });
      expect(job.key, job.net).toBe(key);
    }
    expect(plan.nets.length).toBeGreaterThan(100);
  });

  it('re-keys exactly the jobs whose inputs an edit touches', () => {
    const project = buildDemoProject();
    const keysOf = (p: ProjectData) => new Map([...planBoard(p, { salt: 's' }).nets].map((j) => [j.net, j.key]));
    const changed = (a: Map<string, string>, b: Map<string, string>) => [...a].filter(([net, key]) => b.get(net) !== key).map(([net]) => net).sort();
    const before = keysOf(project);
    // a common-clock net's length: that net only
    const common = project.nets.find((n) => project.buses.find((b) => b.name === n.bus)!.timing.kind === 'common-clock' && n.name !== project.buses.find((b) => b.name === n.bus)!.referenceNet)!;
    const edited = structuredClone(project);
    const segment = edited.nets.find((n) => n.name === common.name)!.elements.find((e) => e.kind === 'segment')!;
    if (segment.kind === 'segment') segment.length *= 1.01;
    expect(changed(before, keysOf(edited))).toEqual([common.name]);
    // a part model: the nets that use it, no other
    const part = project.parts[0];
    const users = project.nets.filter((n) => n.driver.part === part.name || n.receivers.some((r) => r.part === part.name)).map((n) => n.name).sort();
    const withPart = structuredClone(project);
    withPart.parts[0] = { ...withPart.parts[0], description: `${part.description} (edited)` };
    expect(users.length).toBeGreaterThan(0);
    expect(changed(before, keysOf(withPart))).toEqual(users.filter((n) => before.has(n)));
    // the stackup: every net
    const withStackup = structuredClone(project);
    withStackup.stackup.layers[0] = { ...withStackup.stackup.layers[0], thickness: withStackup.stackup.layers[0].thickness * 1.01 };
    expect(changed(before, keysOf(withStackup))).toEqual([...before.keys()].sort());
  });
});

/**
 * The results-cache key (core/hash): FNV-1a 64 against the published test vectors, and independence
 * from property order. Vectors: Fowler/Noll/Vo FNV test suite (IETF draft-eastlake-fnv, FNV-1a 64-bit),
 * "" -> cbf29ce484222325, "a" -> af63dc4c8601ec8c, "foobar" -> 85944171f73967e8.
 */
import { describe, expect, it } from 'vitest';
import { canonicalJson, fnv1a64, fnv1a64Bytes, hashOf, hashOfMembers } from '../../../core/hash/index.js';
import { netSimulationInputs, planBoard, sharedInputsHash } from '../../../core/engine/board.js';
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

describe('hashOfMembers (the same keys from pre-serialised members; behaviour, no numeric source)', () => {
  it('equals hashOf of the object, whatever the members and their order', () => {
    const cases: Record<string, unknown>[] = [
      {},
      { b: 1, a: [1, { y: 2, x: null }], c: 'text' },
      { gone: undefined, kept: 0 },
      { '10': 'ten', '2': 'two', z: true, '01': 'not an index' },
      { big: Number.NaN, small: -Infinity },
    ];
    for (const value of cases) {
      const members = Object.fromEntries(Object.entries(value).map(([k, v]) => [k, canonicalJson(v)]));
      expect(hashOfMembers(members), JSON.stringify(Object.keys(value))).toBe(hashOf(value));
    }
  });

  it("keeps every net job's key of the demo board as hashOf of its inputs (the cache stays valid)", () => {
    const project = buildDemoProject();
    const salt = 'salt for the test';
    const plan = planBoard(project, { salt });
    const shared = sharedInputsHash(project);
    for (const job of plan.nets) {
      const net = project.nets.find((n) => n.name === job.net)!;
      const bus = project.buses.find((b) => b.name === net.bus)!;
      const strobe = job.strobe ? netSimulationInputs(project, project.nets.find((n) => n.name === job.strobe)!, shared) : null;
      const key = hashOf({ salt, guardBand: project.info.guardBand, job: 'net', bus, own: netSimulationInputs(project, net, shared), strobe });
      expect(job.key, job.net).toBe(key);
    }
    expect(plan.nets.length).toBeGreaterThan(100);
  });
});

/**
 * The design format carries every field of the domain model (core/project/model.ts): a project using
 * every field and every element kind survives project -> design text -> project exactly, and every
 * key the model's schemas define appears in that project, so a field added to the model later fails
 * here until the design format carries it (docs/design-file.md §7, Round trip).
 */
import { describe, expect, it } from 'vitest';
import type { z } from 'zod';
import { projectDataSchema, type ProjectData } from '../../../core/project/model.js';
import { projectToDesignText, readDesign } from '../../../core/design/index.js';
import { readFileSync } from 'node:fs';
import { sha256Hex } from '../../../core/hash/sha256.js';

// An invented IBIS file (fixtures/ibis/README.md); the design refers to it by path, the host reads it.
const HERON = readFileSync(new URL('../../../fixtures/ibis/heron_m4.ibs', import.meta.url), 'utf8');

/** Every object key the schema defines, as "parent.key" paths without list indices. */
function schemaKeys(schema: z.ZodType, at: string, out: Set<string>): void {
  const def = (schema as unknown as { _zod: { def: Record<string, unknown> } })._zod.def;
  switch (def.type) {
    case 'object':
      for (const [key, child] of Object.entries(def.shape as Record<string, z.ZodType>)) {
        out.add(`${at}.${key}`);
        schemaKeys(child, `${at}.${key}`, out);
      }
      return;
    case 'array': schemaKeys(def.element as z.ZodType, at, out); return;
    case 'optional': case 'nullable': schemaKeys(def.innerType as z.ZodType, at, out); return;
    case 'union': for (const option of def.options as z.ZodType[]) schemaKeys(option, at, out); return;
    case 'record': schemaKeys(def.valueType as z.ZodType, `${at}.*`, out); return;
    default: return;
  }
}

function dataKeys(value: unknown, at: string, out: Set<string>, recordPaths: ReadonlySet<string>): void {
  if (Array.isArray(value)) { for (const item of value) dataKeys(item, at, out, recordPaths); return; }
  if (value === null || typeof value !== 'object') return;
  for (const [key, child] of Object.entries(value)) {
    const path = recordPaths.has(at) ? `${at}.*` : `${at}.${key}`;
    if (!recordPaths.has(at)) out.add(path);
    dataKeys(child, path, out, recordPaths);
  }
}

const FULL: ProjectData = {
  info: { name: 'Every field', boardRevision: 'C', description: 'model coverage (invented)', guardBand: 20e-12, settleBand: 0.04 },
  stackup: {
    name: 'two layers',
    layers: [
      { name: 'M', kind: 'mask', thickness: 20e-6, dk: 3.4, df: 0.02 },
      { name: 'TOP', kind: 'copper', thickness: 35e-6, role: 'signal', defaultWidth: 0.15e-3 },
      { name: 'D', kind: 'dielectric', thickness: 0.1e-3, dk: 4.1, df: 0.018 },
      { name: 'GND', kind: 'copper', thickness: 35e-6, role: 'plane' },
    ],
  },
  parts: [
    {
      name: 'IO', description: 'both', ioStandard: 'LVCMOS18',
      driver: { vol: 0, voh: 1.8, routHigh: 30, routLow: 28, riseTime: 300e-12, fallTime: 280e-12, tcoMin: 1e-9, tcoMax: 3e-9, refLoad: { ohms: 50, vtt: 0.9, farads: 1e-12 }, vmeas: 0.9 },
      receiver: {
        cin: 2e-12, vil: 0.63, vih: 1.17, vref: 0.9, odtOhms: 120, odtVtt: 0.9, vmaxAbs: 2.1, vminAbs: -0.3, tsetup: 1e-9, thold: 0.5e-9,
        derating: { signalSlews: [1e9, 2e9], strobeSlews: [2e9], setup: [[4e-11], [2e-11]], hold: [[3e-11], [1e-11]] },
      },
      ibis: { file: 'heron_m4.ibs', model: 'dq_in', pin: 'B2' },
    },
    {
      name: 'RX', description: 'input only', ioStandard: '', driver: null,
      receiver: { cin: 1.5e-12, vil: 0.6, vih: 1.2, vref: 0.9, odtOhms: null, odtVtt: 0.9, vmaxAbs: 2.1, vminAbs: -0.3, tsetup: 0.8e-9, thold: 0.4e-9 },
    },
  ],
  buses: [
    { name: 'CC', kind: 'common-clock', description: 'cc', referenceNet: 'CLK', timing: { kind: 'common-clock', cycleTime: 10e-9, clockSkew: -20e-12, jitter: 50e-12 }, allowances: [{ name: 'x', value: 30e-12, appliesTo: 'setup', note: 'n' }], cornerPairing: [{ silicon: 'only', board: 'only' }] },
    { name: 'SS', kind: 'source-synchronous', description: 'ss', referenceNet: 'STB', timing: { kind: 'source-synchronous', tValidBefore: 400e-12, tValidAfter: 380e-12 }, allowances: [], cornerPairing: 'cross' },
  ],
  nets: [
    {
      name: 'CLK', bus: 'CC', role: 'clock', driver: { part: 'IO', node: 'a', designator: 'U1' },
      receivers: [{ part: 'RX', node: 'e', designator: 'U2' }], rails: { vtt: 0.9 },
      elements: [
        { kind: 'segment', a: 'a', b: 'b', layer: 'TOP', width: 0.15e-3, length: 12.7e-3, spacing: 0.1e-3 },
        { kind: 'via', a: 'b', farads: 0.4e-12 },
        { kind: 'line', a: 'b', b: 'c', z0: 55, delay: 80e-12 },
        { kind: 'inductor', a: 'c', b: 'd', henries: 1.2e-9 },
        { kind: 'resistor', a: 'd', b: 'e', ohms: 10 },
        { kind: 'capacitor', a: 'e', b: 'gnd', farads: 0.5e-12 },
        { kind: 'resistor', a: 'e', b: 'vtt', ohms: 60 },
      ],
    },
    { name: 'STB', bus: 'SS', role: 'strobe', driver: { part: 'IO', node: 'a', designator: 'U1' }, receivers: [{ part: 'IO', node: 'b', designator: 'U3' }], rails: {}, elements: [{ kind: 'segment', a: 'a', b: 'b', layer: 'TOP', width: 0.12e-3, length: 30e-3 }] },
    { name: 'D0', bus: 'SS', role: 'data', driver: { part: 'IO', node: 'a', designator: 'U1' }, receivers: [{ part: 'IO', node: 'b', designator: 'U3' }], rails: {}, elements: [{ kind: 'segment', a: 'a', b: 'b', layer: 'TOP', width: 0.12e-3, length: 31e-3 / 3 }] },
  ],
  corners: [{ name: 'only', driverStrength: 1.1, edgeRate: 1.2, dk: 1.03, widthDelta: -10e-6, rail: 0.97, cin: 1.1, tco: 'max' }],
  ibisFiles: [{ name: 'heron_m4.ibs', sha256: sha256Hex(HERON), text: HERON }],
  // Invented waivers: a timing one (margin in s) and a signal-check one (margin in V).
  waivers: [
    { net: 'CLK', check: 'overshoot', status: 'fail', margin: -0.0123, unit: 'V', comment: 'clamped by the receiver diode', author: 'R. Vale', at: '2026-12-01T10:00:00.000Z' },
    { net: 'D0', check: 'hold margin', status: 'tight', margin: 12e-12, unit: 's', comment: 'accepted for the first spin', author: 'R. Vale', at: '2026-12-01T10:05:00.000Z' },
  ],
};

describe('design format covers the domain model', () => {
  it('a project using every field round-trips exactly', () => {
    const text = projectToDesignText(FULL);
    expect(readDesign('full.yaml', text, new Map([['heron_m4.ibs', HERON]]))).toEqual(FULL);
  });

  it('every key of the model schemas appears in that project', () => {
    const model = new Set<string>();
    schemaKeys(projectDataSchema, '', model);
    const used = new Set<string>();
    dataKeys(FULL, '', used, new Set(['.nets.rails']));
    const missing = [...model].filter((k) => !used.has(k) && !k.endsWith('.*'));
    expect(missing, 'model fields the coverage project (and so perhaps the design format) does not carry').toEqual([]);
  });
});

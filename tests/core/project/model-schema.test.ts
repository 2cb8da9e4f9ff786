/**
 * The domain model is defined once, as zod schemas with inferred types (core/project/model.ts): the
 * fixtures written for tests and the demo must satisfy the same schema the hosts check incoming data
 * with, and the schema must refuse what the model cannot hold. Source: the model's own definition —
 * behaviour, no numeric source needed.
 */
import { describe, expect, it } from 'vitest';
import { readFileSync } from 'node:fs';
import { projectDataSchema, netElementSchema } from '../../../core/project/model.js';
import { emptyProject } from '../../../core/project/empty.js';

const heronRidge = JSON.parse(readFileSync(new URL('../../../fixtures/report/heron-ridge.project.json', import.meta.url), 'utf8'));

describe('project data schema', () => {
  it('accepts the report fixture board and an empty project', () => {
    expect(projectDataSchema.safeParse(heronRidge).error?.issues ?? []).toEqual([]);
    expect(projectDataSchema.safeParse(emptyProject('new board')).success).toBe(true);
  });

  it('refuses an unknown key, a non-finite number and a wrong element kind, naming the path', () => {
    const extra = { ...heronRidge, info: { ...heronRidge.info, colour: 'red' } };
    expect(projectDataSchema.safeParse(extra).error?.issues[0].path).toEqual(['info']);
    const nan = structuredClone(heronRidge);
    nan.corners[0].dk = Number.NaN;
    expect(projectDataSchema.safeParse(nan).error?.issues[0].path).toEqual(['corners', 0, 'dk']);
    expect(netElementSchema.safeParse({ kind: 'diode', a: 'x', b: 'y' }).success).toBe(false);
    expect(netElementSchema.safeParse({ kind: 'resistor', a: 'x', b: 'y', ohms: -1 }).success).toBe(false);
  });
});

/**
 * The committed report fixture (fixtures/report/heron-ridge.*.json) is what its generator
 * (fixtures/report/generate-heron-ridge.ts) builds, so neither can be edited without the other.
 * Importing the generator writes nothing (its main runs only when it is the script being run).
 */
import { readFileSync } from 'node:fs';
import { fileURLToPath } from 'node:url';
import { describe, expect, it } from 'vitest';
import { buildHeronRidge } from '../../../fixtures/report/generate-heron-ridge.js';

const dir = fileURLToPath(new URL('../../../fixtures/report/', import.meta.url));
const load = (name: string): unknown => JSON.parse(readFileSync(`${dir}${name}`, 'utf8'));

/**
 * Paths where two parsed JSON values differ. Numbers agree within 1e-15 relative (about 4.5 ulp of a
 * double): the files were first written by another language's JSON writer and arithmetic, and this
 * forgives last-bit differences of summation order or a writer printing 16 significant digits (at
 * most 5e-16 relative), while any value a person changes moves far more (common practice, no
 * source). Today every number is bit-identical. Everything else must be equal.
 */
function differences(actual: unknown, expected: unknown, path = '$'): string[] {
  if (typeof actual === 'number' && typeof expected === 'number') {
    const scale = Math.max(Math.abs(actual), Math.abs(expected));
    return actual === expected || Math.abs(actual - expected) <= 1e-15 * scale ? [] : [`${path}: ${actual} vs ${expected}`];
  }
  if (Array.isArray(actual) || Array.isArray(expected)) {
    if (!Array.isArray(actual) || !Array.isArray(expected)) return [`${path}: array vs non-array`];
    if (actual.length !== expected.length) return [`${path}: ${actual.length} vs ${expected.length} entries`];
    return actual.flatMap((x, i) => differences(x, expected[i], `${path}[${i}]`));
  }
  if (actual !== null && expected !== null && typeof actual === 'object' && typeof expected === 'object') {
    const a = actual as Record<string, unknown>;
    const e = expected as Record<string, unknown>;
    const keys = [...new Set([...Object.keys(a), ...Object.keys(e)])].sort();
    return keys.flatMap((k) => (k in a && k in e ? differences(a[k], e[k], `${path}.${k}`) : [`${path}.${k}: present on one side only`]));
  }
  return actual === expected ? [] : [`${path}: ${JSON.stringify(actual)} vs ${JSON.stringify(expected)}`];
}

describe('heron-ridge report fixture', () => {
  // Compared as the generator would write them (JSON round trip drops keys whose value is undefined).
  const built = JSON.parse(JSON.stringify(buildHeronRidge())) as { project: unknown; result: unknown };

  it('the project file is what the generator builds', () => {
    // Source: the generator itself; the comparison is value by value, key order and number text aside.
    expect(differences(built.project, load('heron-ridge.project.json'))).toEqual([]);
  });

  it('the result file is what the generator builds', () => {
    expect(differences(built.result, load('heron-ridge.result.json'))).toEqual([]);
  });

  it('the comparison notices a changed number, key and string', () => {
    // Hand-made counterexamples (common practice, no source): the check above must be able to fail.
    expect(differences({ a: 1e-10 }, { a: 1e-10 * (1 + 1e-14) })).toHaveLength(1);
    expect(differences({ a: 1e-10 }, { a: 1e-10 * (1 + 1e-16) })).toEqual([]);
    expect(differences({ a: 1 }, { b: 1 })).toHaveLength(2);
    expect(differences(['x'], ['y'])).toEqual(['$[0]: "x" vs "y"']);
  });
});

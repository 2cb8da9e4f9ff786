/**
 * The JSON Schema editors use (docs/design-file.schema.json) is the one the checker applies
 * (core/design/schema.ts), and the checker follows JSON Schema 2020-12 for the keywords it implements
 * (json-schema.org "JSON Schema Validation" §6: type, const, enum, required, additionalProperties,
 * items, minItems, minLength, anyOf).
 */
import { describe, expect, it } from 'vitest';
import { readFileSync } from 'node:fs';
import { DESIGN_SCHEMA } from '../../../core/design/schema.js';
import { checkJsonSchema } from '../../../core/design/json-schema.js';

describe('design file JSON Schema', () => {
  it('docs/design-file.schema.json is the schema the checker uses', () => {
    const file = JSON.parse(readFileSync(new URL('../../../docs/design-file.schema.json', import.meta.url), 'utf8'));
    expect(file).toEqual(JSON.parse(JSON.stringify(DESIGN_SCHEMA)));
  });

  it('applies each keyword as JSON Schema 2020-12 defines it', () => {
    const schema = {
      type: 'object',
      properties: {
        v: { const: 1 },
        k: { enum: ['a', 'b'] },
        n: { type: 'number' },
        s: { type: 'string', minLength: 1 },
        list: { type: 'array', minItems: 1, items: { $ref: '#/$defs/item' } },
        maybe: { anyOf: [{ $ref: '#/$defs/item' }, { type: 'null' }] },
      },
      required: ['v'],
      additionalProperties: false,
      $defs: { item: { type: 'object', properties: { x: { type: 'integer' } }, required: ['x'], additionalProperties: false } },
    };
    expect(checkJsonSchema({ v: 1, k: 'a', n: 2.5, s: 'x', list: [{ x: 3 }], maybe: null }, schema)).toEqual([]);
    const issues = checkJsonSchema({ k: 'c', n: '2', s: '', list: [], maybe: { x: 1.5 }, extra: 0 }, schema);
    expect(issues.map((i) => `${i.path.join('.')}: ${i.message}`)).toEqual([
      ': the field "v" is missing',
      'k: must be one of "a", "b", got the text "c"',
      'n: expected a number, got the text "2"',
      's: must not be empty',
      'list: needs at least 1 entry',
      'maybe.x: expected a whole number, got 1.5',
      'extra: unknown key "extra" (expected one of: v, k, n, s, list, maybe)',
    ]);
  });
});

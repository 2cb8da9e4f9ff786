/**
 * A small JSON Schema checker for the keywords the design file's schema uses (type, const, enum,
 * properties, required, additionalProperties, items, minItems, minLength, anyOf, $ref into $defs).
 * Keywords follow JSON Schema 2020-12 (json-schema.org, "JSON Schema Validation" §6); anything else
 * in a schema is ignored. Every problem comes back with its field path, all of them, not the first.
 */
import type { DesignIssue, FieldPath } from './located.js';

type Schema = Record<string, unknown>;

const typeOf = (value: unknown): string => {
  if (value === null) return 'null';
  if (Array.isArray(value)) return 'array';
  if (typeof value === 'number') return Number.isInteger(value) ? 'integer' : 'number';
  return typeof value;
};

const matchesType = (value: unknown, type: string): boolean => {
  const actual = typeOf(value);
  return actual === type || (type === 'number' && actual === 'integer');
};

const describe = (value: unknown): string => {
  const t = typeOf(value);
  if (t === 'string') return `the text "${String(value)}"`;
  if (t === 'number' || t === 'integer' || t === 'boolean') return `${String(value)}`;
  return t === 'array' ? 'a list' : t === 'object' ? 'a map' : t;
};

const TYPE_WORDS: Record<string, string> = {
  object: 'a map', array: 'a list', string: 'text', number: 'a number', integer: 'a whole number', null: 'null', boolean: 'true or false',
};

export function checkJsonSchema(value: unknown, root: Schema): DesignIssue[] {
  const issues: DesignIssue[] = [];
  const defs = (root.$defs ?? {}) as Record<string, Schema>;
  const resolve = (schema: Schema): Schema => {
    let s = schema;
    for (let guard = 0; typeof s.$ref === 'string' && guard < 20; guard += 1) {
      const name = (s.$ref as string).replace('#/$defs/', '');
      s = { ...defs[name], ...Object.fromEntries(Object.entries(s).filter(([k]) => k !== '$ref')) };
    }
    return s;
  };

  const visit = (v: unknown, schemaIn: Schema, path: FieldPath, out: DesignIssue[]): void => {
    const schema = resolve(schemaIn);
    if (Array.isArray(schema.anyOf)) {
      const branches = (schema.anyOf as Schema[]).map((branch) => {
        const found: DesignIssue[] = [];
        visit(v, branch, path, found);
        return found;
      });
      if (branches.some((b) => b.length === 0)) return;
      // Report the branch whose type fits (a map against the map branch), else the first.
      const fitting = (schema.anyOf as Schema[]).findIndex((b) => {
        const t = resolve(b).type;
        return typeof t === 'string' && matchesType(v, t);
      });
      out.push(...branches[fitting >= 0 ? fitting : 0]);
      return;
    }
    if ('const' in schema && v !== schema.const) {
      out.push({ path, message: `must be ${JSON.stringify(schema.const)}, got ${describe(v)}` });
      return;
    }
    if (Array.isArray(schema.enum) && !(schema.enum as unknown[]).includes(v)) {
      out.push({ path, message: `must be one of ${(schema.enum as unknown[]).map((e) => JSON.stringify(e)).join(', ')}, got ${describe(v)}` });
      return;
    }
    if (schema.type !== undefined) {
      const types = Array.isArray(schema.type) ? (schema.type as string[]) : [schema.type as string];
      if (!types.some((t) => matchesType(v, t))) {
        out.push({ path, message: `expected ${types.map((t) => TYPE_WORDS[t] ?? t).join(' or ')}, got ${describe(v)}` });
        return;
      }
    }
    if (typeof v === 'string' && typeof schema.minLength === 'number' && v.length < schema.minLength) {
      out.push({ path, message: 'must not be empty' });
    }
    if (Array.isArray(v)) {
      if (typeof schema.minItems === 'number' && v.length < schema.minItems) {
        out.push({ path, message: `needs at least ${schema.minItems} entr${schema.minItems === 1 ? 'y' : 'ies'}` });
      }
      if (schema.items) v.forEach((item, i) => visit(item, schema.items as Schema, [...path, i], out));
      return;
    }
    if (typeOf(v) === 'object') {
      const obj = v as Record<string, unknown>;
      const properties = (schema.properties ?? {}) as Record<string, Schema>;
      for (const key of (schema.required ?? []) as string[]) {
        if (!(key in obj)) out.push({ path, message: `the field "${key}" is missing` });
      }
      const known = Object.keys(properties);
      for (const [key, item] of Object.entries(obj)) {
        if (key in properties) visit(item, properties[key], [...path, key], out);
        else if (schema.additionalProperties === false) {
          out.push({ path: [...path, key], atKey: true, message: `unknown key "${key}" (expected one of: ${known.join(', ')})` });
        } else if (typeof schema.additionalProperties === 'object') {
          visit(item, schema.additionalProperties as Schema, [...path, key], out);
        }
      }
    }
  };

  visit(value, root, [], issues);
  return issues;
}

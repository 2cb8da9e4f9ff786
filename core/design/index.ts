/**
 * Design files (docs/design-file.md): YAML text -> project, all-or-nothing, and project -> text.
 * `readDesign` checks syntax, then the JSON Schema (core/design/schema.ts), then the rules
 * (core/design/build.ts), and lists every problem with file, line, column and field path.
 */
import { InputError } from '../errors.js';
import type { ProjectData } from '../project/model.js';
import { buildProject } from './build.js';
import { checkJsonSchema } from './json-schema.js';
import { formatIssue, formatPath, readDesignText, type DesignIssue } from './located.js';
import { DESIGN_SCHEMA } from './schema.js';

export { DESIGN_SCHEMA } from './schema.js';
export { projectToDesignText, projectToDesignValue, exactQuantity } from './write.js';
export { formatPath, type DesignIssue, type FieldPath } from './located.js';

/** A design file with problems: `problems` holds one placed message per problem, in file order. */
export class DesignFileError extends InputError {
  readonly problems: readonly string[];
  constructor(file: string, problems: readonly string[]) {
    super(file, `${problems.length} problem${problems.length === 1 ? '' : 's'}, nothing was written:\n  ${problems.join('\n  ')}`);
    this.name = 'DesignFileError';
    this.problems = problems;
  }
}

/** One problem of a design file as data: where it is (1-based line and column), the field, what is wrong. */
export interface PlacedProblem {
  line: number;
  column: number;
  /** "buses[2].nets[5].length"; null for a YAML syntax error (it has a place but no field yet). */
  field: string | null;
  message: string;
}

export interface DesignCheck {
  project: ProjectData | null;
  /** Placed messages: "file:line:column: field.path: what is wrong". */
  problems: string[];
  /** The same problems, in the same order, as data. */
  placed: PlacedProblem[];
}

/**
 * Checks a design file's text; the project comes back only when there is no problem at all.
 * `ibisTexts` holds the text of each .ibs file its ibisFiles name, by path as written (read by the host).
 */
export function checkDesign(file: string, text: string, ibisTexts: ReadonlyMap<string, string> = new Map()): DesignCheck {
  const located = readDesignText(file, text);
  if (located.syntaxErrors.length > 0) {
    return { project: null, problems: located.syntaxErrors, placed: located.syntaxPlaces.map((p) => ({ ...p, field: null })) };
  }
  const schemaIssues = checkJsonSchema(located.value, DESIGN_SCHEMA);
  const built = buildProject(located.value, ibisTexts);
  const seen = new Set<string>();
  const all: DesignIssue[] = [...schemaIssues, ...built.issues];
  const found = all
    .map((issue) => ({ text: formatIssue(located, issue), place: located.locate(issue.path, issue.atKey), issue }))
    .filter(({ text: m }) => (seen.has(m) ? false : (seen.add(m), true)));
  found.sort((x, y) => x.place.line - y.place.line || x.place.column - y.place.column);
  const problems = found.map((f) => f.text);
  const placed = found.map(({ place, issue }) => ({ ...place, field: formatPath(issue.path), message: issue.message }));
  return { project: problems.length === 0 ? built.project : null, problems, placed };
}

/**
 * The .ibs paths a design file's ibisFiles name, as written (for the host to read before checking);
 * empty when the text does not parse or has none (checkDesign reports why).
 */
export function designIbisPaths(file: string, text: string): string[] {
  const located = readDesignText(file, text);
  if (located.syntaxErrors.length > 0) return [];
  const value = located.value as { ibisFiles?: unknown };
  if (!Array.isArray(value?.ibisFiles)) return [];
  return value.ibisFiles
    .map((f: unknown) => (typeof f === 'object' && f !== null && typeof (f as { path?: unknown }).path === 'string' ? (f as { path: string }).path : null))
    .filter((p): p is string => p !== null && p.length > 0);
}

/** The project a design file describes; throws DesignFileError listing every problem. */
export function readDesign(file: string, text: string, ibisTexts: ReadonlyMap<string, string> = new Map()): ProjectData {
  const { project, problems } = checkDesign(file, text, ibisTexts);
  if (!project || problems.length > 0) throw new DesignFileError(file, problems);
  return project;
}

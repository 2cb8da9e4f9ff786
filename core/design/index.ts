/**
 * Design files (docs/design-file.md): YAML text -> project, all-or-nothing, and project -> text.
 * `readDesign` checks syntax, then the JSON Schema (core/design/schema.ts), then the rules
 * (core/design/build.ts), and lists every problem with file, line, column and field path.
 */
import { InputError } from '../errors.js';
import type { ProjectData } from '../project/model.js';
import { buildProject } from './build.js';
import { checkJsonSchema } from './json-schema.js';
import { formatIssue, readDesignText, type DesignIssue } from './located.js';
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

export interface DesignCheck {
  project: ProjectData | null;
  /** Placed messages: "file:line:column: field.path: what is wrong". */
  problems: string[];
}

const lineOf = (message: string): [number, number] => {
  const m = /:(\d+):(\d+): /.exec(message);
  return m ? [Number(m[1]), Number(m[2])] : [0, 0];
};

/** Checks a design file's text; the project comes back only when there is no problem at all. */
export function checkDesign(file: string, text: string): DesignCheck {
  const located = readDesignText(file, text);
  if (located.syntaxErrors.length > 0) return { project: null, problems: located.syntaxErrors };
  const schemaIssues = checkJsonSchema(located.value, DESIGN_SCHEMA);
  const built = buildProject(located.value);
  const seen = new Set<string>();
  const all: DesignIssue[] = [...schemaIssues, ...built.issues];
  const problems = all.map((issue) => formatIssue(located, issue)).filter((m) => (seen.has(m) ? false : (seen.add(m), true)));
  problems.sort((x, y) => {
    const [lx, cx] = lineOf(x);
    const [ly, cy] = lineOf(y);
    return lx - ly || cx - cy;
  });
  return { project: problems.length === 0 ? built.project : null, problems };
}

/** The project a design file describes; throws DesignFileError listing every problem. */
export function readDesign(file: string, text: string): ProjectData {
  const { project, problems } = checkDesign(file, text);
  if (!project || problems.length > 0) throw new DesignFileError(file, problems);
  return project;
}

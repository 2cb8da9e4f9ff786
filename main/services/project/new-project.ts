/**
 * A new project from the workbench (docs/workbench.md §New project): the project a design file's text
 * describes (docs/design-file.md, checked in full by core/design's checkDesign, every problem placed),
 * or an empty one; and where a host with a fixed folder may put the new file. Nothing here writes:
 * the composition root creates the file only from an answer without problems.
 */
import { existsSync } from 'node:fs';
import { basename, extname, join, resolve } from 'node:path';
import { InputError } from '../../../core/errors.js';
import { checkDesign, designIbisPaths } from '../../../core/design/index.js';
import { partIbis } from '../../../core/netbuild/ibis-parts.js';
import { emptyProject } from '../../../core/project/empty.js';
import { validateProject } from '../../../core/project/validate.js';
import type { ProjectData } from '../../../core/project/model.js';
import type { NewProjectProblem, NewProjectRequest, NewProjectResult } from '../../../core/contract/api.js';

export const PROJECT_EXTENSION = '.slackline';

export interface NewProjectBuild {
  /** The project to create; null when there is any problem. */
  data: ProjectData | null;
  result: NewProjectResult;
}

/** The file name part of a path written with either separator. */
const leafOf = (path: string): string => path.split(/[\\/]/).pop() ?? path;

/**
 * The design's ibisFiles paths matched to the files the request carries: the same path as written,
 * else the same file name (a browser gives only the name of a picked file).
 */
function matchIbisFiles(designPaths: string[], given: { path: string; text: string }[]): { texts: Map<string, string>; missing: string[] } {
  const texts = new Map<string, string>();
  const missing: string[] = [];
  for (const path of designPaths) {
    const exact = given.find((g) => g.path === path);
    const byName = given.filter((g) => leafOf(g.path) === leafOf(path));
    const match = exact ?? (byName.length === 1 ? byName[0] : undefined);
    if (match) texts.set(path, match.text);
    else missing.push(path);
  }
  return { texts, missing };
}

function outlineOf(data: ProjectData): NonNullable<NewProjectResult['outline']> {
  return {
    name: data.info.name,
    boardRevision: data.info.boardRevision,
    buses: data.buses.length,
    nets: data.nets.length,
    parts: data.parts.length,
    ibisFiles: (data.ibisFiles ?? []).map((f) => f.name),
  };
}

/** Any other refusal (a model not in its IBIS file, a rule of validateProject) as an unplaced problem. */
function unplaced(file: string, error: unknown): NewProjectProblem {
  if (error instanceof InputError) return { file, line: null, column: null, field: error.where, message: error.reason };
  throw error;
}

function fromDesign(design: NonNullable<NewProjectRequest['design']>): NewProjectBuild {
  const file = leafOf(design.fileName);
  const named = designIbisPaths(file, design.text);
  const { texts, missing } = matchIbisFiles(named, design.ibisFiles);
  const check = checkDesign(file, design.text, texts);
  const problems: NewProjectProblem[] = check.placed.map((p) => ({ file, ...p }));
  let data = check.project;
  if (data) {
    // Each part's IBIS model, parsed in full (docs/ibis.md §9): every part's problem, not only the first.
    for (const part of data.parts) {
      try {
        partIbis(part, data.ibisFiles);
      } catch (error) {
        problems.push(unplaced(file, error));
      }
    }
    if (problems.length === 0) {
      try {
        validateProject(data);
      } catch (error) {
        problems.push(unplaced(file, error));
      }
    }
  }
  if (problems.length > 0) data = null;
  const outline = check.project ? outlineOf(check.project) : null;
  return { data, result: { outcome: data ? 'checked' : 'invalid', path: null, problems, namedIbisFiles: named, missingIbisFiles: missing, outline } };
}

function fromEmpty(empty: NonNullable<NewProjectRequest['empty']>): NewProjectBuild {
  const name = empty.name.trim();
  const problems: NewProjectProblem[] = [];
  if (name === '') problems.push({ file: 'new project', line: null, column: null, field: 'name', message: 'is required' });
  const data = emptyProject(name);
  data.info.boardRevision = (empty.boardRevision ?? '').trim();
  data.info.description = (empty.description ?? '').trim();
  if (problems.length === 0) {
    try {
      validateProject(data);
    } catch (error) {
      problems.push(unplaced('new project', error));
    }
  }
  return {
    data: problems.length === 0 ? data : null,
    result: { outcome: problems.length === 0 ? 'checked' : 'invalid', path: null, problems, namedIbisFiles: [], missingIbisFiles: [], outline: outlineOf(data) },
  };
}

/** The project a request describes, or every problem it has (placed where the input has places). */
export function buildNewProject(request: NewProjectRequest): NewProjectBuild {
  if (request.design && !request.empty) return fromDesign(request.design);
  if (request.empty && !request.design) return fromEmpty(request.empty);
  throw new InputError('new project', 'give exactly one of a design file and an empty project');
}

/** Characters a new project's file name may hold in a host-chosen folder (no separators, no leading dot). */
const SAFE_NAME = /^[A-Za-z0-9][A-Za-z0-9 ._()+-]*$/;

/**
 * The new file for `name` in `folder`, a host's fixed place for new projects: a plain file name only
 * (no folder part, no "..", no leading dot), ".slackline" added when it has no extension, any other
 * extension refused; an existing file is refused (nothing is ever replaced).
 */
export function projectFileInFolder(folder: string, name: string | undefined): string {
  const given = (name ?? '').trim();
  if (given === '') throw new InputError('new project file name', 'is required');
  if (/[\\/]/.test(given) || given.includes('..') || !SAFE_NAME.test(given)) {
    throw new InputError('new project file name', `"${given}" must be a plain file name (letters, digits, space . _ ( ) + -; no folder part): new projects go in ${folder}`);
  }
  const ext = extname(given);
  if (ext !== '' && ext !== PROJECT_EXTENSION) throw new InputError('new project file name', `must end in ${PROJECT_EXTENSION} (or have no extension), not "${ext}"`);
  const path = resolve(join(folder, ext === '' ? `${given}${PROJECT_EXTENSION}` : given));
  if (existsSync(path)) throw new InputError(`new project file ${basename(path)}`, `exists already in ${folder}; nothing was replaced: choose another name`);
  return path;
}

/**
 * Design files on disk (docs/design-file.md): a project built from one, all-or-nothing, and a
 * project's design file written out. The format itself lives in core/design.
 */
import { existsSync, readFileSync, writeFileSync, renameSync } from 'node:fs';
import { InputError } from '../../../core/errors.js';
import { projectToDesignText, readDesign } from '../../../core/design/index.js';
import type { ProjectData } from '../../../core/project/model.js';
import { ProjectStore, type ProjectStoreOptions } from './project-store.js';

/** Reads and checks a design file; throws DesignFileError listing every problem. */
export function readDesignFile(designPath: string): ProjectData {
  let text: string;
  try {
    text = readFileSync(designPath, 'utf8');
  } catch (error) {
    throw new InputError(designPath, `cannot be read (${(error as { code?: string }).code ?? String(error)})`);
  }
  return readDesign(designPath, text);
}

/**
 * Creates the project file `projectPath` from a design file. Nothing is written unless the whole
 * design is valid, and an existing file is never replaced.
 */
export function createProjectFromDesign(projectPath: string, designPath: string, options: ProjectStoreOptions = {}): ProjectData {
  if (existsSync(projectPath)) throw new InputError(projectPath, 'exists already; choose a new project file name');
  const data = readDesignFile(designPath);
  ProjectStore.create(projectPath, data, options).close();
  return data;
}

const HEADER = (project: ProjectData) =>
  ` Design file of "${project.info.name}" (docs/design-file.md), written by slackline design.`;

/** The design file text of a project file. */
export function designTextOf(projectPath: string): string {
  const store = ProjectStore.open(projectPath);
  try {
    const data = store.load();
    return projectToDesignText(data, HEADER(data));
  } finally {
    store.close();
  }
}

/** Writes text to `outPath` through a temporary file, so a failed write leaves no half file. */
export function writeTextFile(outPath: string, text: string): void {
  const temp = `${outPath}.partial`;
  try {
    writeFileSync(temp, text, 'utf8');
    renameSync(temp, outPath);
  } catch (error) {
    throw new InputError(outPath, `cannot be written (${(error as { code?: string }).code ?? String(error)})`);
  }
}

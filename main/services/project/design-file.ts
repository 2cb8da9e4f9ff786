/**
 * Design files on disk (docs/design-file.md): a project built from one, all-or-nothing, and a
 * project's design file written out. The format itself lives in core/design.
 */
import { existsSync, readFileSync, writeFileSync, renameSync } from 'node:fs';
import { dirname, resolve } from 'node:path';
import { InputError } from '../../../core/errors.js';
import { designIbisPaths, projectToDesignText, readDesign } from '../../../core/design/index.js';
import { checkProjectIbis } from '../../../core/netbuild/ibis-parts.js';
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
  // IBIS files are named relative to the design file (docs/ibis.md §9); each is parsed in full here
  // (errors name file, line and keyword) so nothing is created from a design with a bad model.
  const ibisTexts = new Map<string, string>();
  for (const path of designIbisPaths(designPath, text)) {
    const full = resolve(dirname(designPath), path);
    try {
      ibisTexts.set(path, readFileSync(full, 'utf8'));
    } catch (error) {
      const code = (error as { code?: string }).code;
      throw new InputError(full, code === 'ENOENT' ? `IBIS file not found (named in ${designPath} ibisFiles)` : `cannot be read (${code ?? String(error)})`);
    }
  }
  const data = readDesign(designPath, text, ibisTexts);
  checkProjectIbis(data);
  return data;
}

/**
 * Writes each stored IBIS file of a project beside a design file written to `designPath` (the design
 * names them by file name, core/design/write.ts). A file already there with other content is not
 * overwritten: that is an error naming it.
 */
export function writeIbisFilesBeside(designPath: string, project: ProjectData): string[] {
  const written: string[] = [];
  for (const f of project.ibisFiles ?? []) {
    const out = resolve(dirname(designPath), f.name);
    if (existsSync(out)) {
      if (readFileSync(out, 'utf8') === f.text) continue;
      throw new InputError(out, 'exists with other content; move it away to write the project\'s IBIS file there');
    }
    writeTextFile(out, f.text);
    written.push(out);
  }
  return written;
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

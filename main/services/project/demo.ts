/**
 * Creates the demo project file (the invented board of fixtures/demo) in a folder. The CLI's
 * `slackline demo` calls this; later steps (check, report) build on the file it returns.
 */
import { mkdirSync, rmSync, existsSync } from 'node:fs';
import { join, resolve } from 'node:path';
import { InputError } from '../../../core/errors.js';
import { buildDemoProject } from '../../../fixtures/demo/demo-project.js';
import { isSlacklineProjectFile } from '../db/open-database.js';
import { ProjectStore, type ProjectStoreOptions } from './project-store.js';

export const DEMO_FILE_NAME = 'demo.slackline';

/**
 * Writes DIR/demo.slackline and returns its absolute path. An earlier demo project in that place is
 * replaced; any other file of that name is refused and left alone.
 */
export function createDemoProject(dir: string, options: ProjectStoreOptions = {}): string {
  try {
    mkdirSync(dir, { recursive: true });
  } catch (error) {
    throw new InputError(dir, `cannot be used as the output folder (${(error as { code?: string }).code ?? String(error)})`);
  }
  const path = resolve(join(dir, DEMO_FILE_NAME));
  if (existsSync(path)) {
    if (!isSlacklineProjectFile(path)) {
      throw new InputError(path, 'exists and is not a Slackline project; move it away or choose another --out folder');
    }
    for (const file of [path, `${path}-wal`, `${path}-shm`]) rmSync(file, { force: true });
  }
  ProjectStore.create(path, buildDemoProject(), options).close();
  return path;
}

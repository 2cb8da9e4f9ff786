/**
 * Creates the demo project file in a folder from the shipped design file of the invented demo board
 * (fixtures/demo/demo.design.yaml, docs/design-file.md). The CLI's `slackline demo` calls this; later
 * steps (check, report) build on the file it returns.
 */
import { mkdirSync, rmSync, existsSync } from 'node:fs';
import { dirname, join, resolve } from 'node:path';
import { fileURLToPath } from 'node:url';
import { InputError } from '../../../core/errors.js';
import { readDesignFile } from './design-file.js';
import type { ProjectData } from '../../../core/project/model.js';
import { isSlacklineProjectFile } from '../db/open-database.js';
import { ProjectStore, type ProjectStoreOptions } from './project-store.js';

export const DEMO_FILE_NAME = 'demo.slackline';
const DEMO_DESIGN = join('fixtures', 'demo', 'demo.design.yaml');

/**
 * The shipped demo design file: the nearest folder above this module (in the sources or in a
 * bundle under out/) that holds fixtures/demo/demo.design.yaml.
 */
export function demoDesignPath(): string {
  let dir = dirname(fileURLToPath(import.meta.url));
  for (;;) {
    const candidate = join(dir, DEMO_DESIGN);
    if (existsSync(candidate)) return candidate;
    const parent = dirname(dir);
    if (parent === dir) throw new InputError(DEMO_DESIGN, 'the demo design file is missing from this installation');
    dir = parent;
  }
}

/** The demo project as data, read from its design file with the IBIS files it names beside it. */
export function loadDemoProject(): ProjectData {
  return readDesignFile(demoDesignPath());
}

/**
 * Writes DIR/demo.slackline and returns its absolute path. An earlier demo project in that place is
 * replaced; any other file of that name is refused and left alone.
 */
export function createDemoProject(dir: string, options: ProjectStoreOptions = {}): string {
  const data = loadDemoProject(); // read before touching the folder: a broken install changes nothing
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
    // The earlier demo's session backup copy goes with it (docs/reliability.md §2).
    for (const file of [path, `${path}-wal`, `${path}-shm`, `${path}.last-good`]) rmSync(file, { force: true });
  }
  ProjectStore.create(path, data, options).close();
  return path;
}

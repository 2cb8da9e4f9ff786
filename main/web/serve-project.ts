/**
 * The loopback host's composition root: opens a project through the services and serves it with the
 * built renderer. Used by `npm run web` (start.ts), `npm start` without Electron, and the e2e tests.
 */
import { dirname, join, resolve } from 'node:path';
import { fileURLToPath } from 'node:url';
import { openWorkbenchSession, ensureDemoProject, folderPlacement, type Workbench } from '../services/compose.js';
import { startWebShell, type WebShell } from './server.js';

const repoRoot = resolve(dirname(fileURLToPath(import.meta.url)), '..', '..');
export const DEFAULT_RENDERER_DIR = join(repoRoot, 'out', 'renderer');

export interface ServeOptions {
  /** Project file; absent: the demo project in DEFAULT_DEMO_DIR, created when missing. */
  projectPath?: string;
  port?: number;
  rendererDir?: string;
  token?: string;
  /**
   * Open the project read-only even where it could be written (docs/workbench.md, "Read-only
   * projects"); a project created from the workbench afterwards opens writable.
   */
  readOnly?: boolean;
}

export interface ServedProject {
  /** The project open now (it changes when the workbench creates a new project). */
  readonly projectPath: string;
  shell: WebShell;
  /** The open project's services (they change with it). */
  readonly workbench: Workbench;
  /** Where new projects go: the folder of the project the shell was started on, fixed for the run. */
  newProjectFolder: string;
  close(): Promise<void>;
}

export async function serveProject(options: ServeOptions = {}): Promise<ServedProject> {
  const projectPath = options.projectPath ? resolve(options.projectPath) : ensureDemoProject();
  // The browser can name only a plain file name in this folder, never another place on the disk
  // (docs/workbench.md §New project).
  const newProjectFolder = dirname(projectPath);
  const session = await openWorkbenchSession(projectPath, folderPlacement(newProjectFolder), { firstReadOnly: options.readOnly });
  let shell: WebShell;
  try {
    shell = await startWebShell({
      api: () => session.current.api,
      rendererDir: options.rendererDir ?? DEFAULT_RENDERER_DIR,
      port: options.port,
      token: options.token,
    });
  } catch (error) {
    await session.close();
    throw error;
  }
  return {
    get projectPath() {
      return session.current.projectPath;
    },
    shell,
    get workbench() {
      return session.current;
    },
    newProjectFolder,
    async close() {
      await shell.close();
      await session.close();
    },
  };
}

/**
 * The loopback host's composition root: opens a project through the services and serves it with the
 * built renderer. Used by `npm run web` (start.ts), `npm start` without Electron, and the e2e tests.
 */
import { dirname, join, resolve } from 'node:path';
import { fileURLToPath } from 'node:url';
import { openWorkbench, ensureDemoProject, type Workbench } from '../services/compose.js';
import { startWebShell, type WebShell } from './server.js';

const repoRoot = resolve(dirname(fileURLToPath(import.meta.url)), '..', '..');
export const DEFAULT_RENDERER_DIR = join(repoRoot, 'out', 'renderer');

export interface ServeOptions {
  /** Project file; absent: the demo project in DEFAULT_DEMO_DIR, created when missing. */
  projectPath?: string;
  port?: number;
  rendererDir?: string;
  token?: string;
}

export interface ServedProject {
  projectPath: string;
  shell: WebShell;
  workbench: Workbench;
  close(): Promise<void>;
}

export async function serveProject(options: ServeOptions = {}): Promise<ServedProject> {
  const projectPath = options.projectPath ? resolve(options.projectPath) : ensureDemoProject();
  const workbench = await openWorkbench(projectPath);
  let shell: WebShell;
  try {
    shell = await startWebShell({
      api: workbench.api,
      rendererDir: options.rendererDir ?? DEFAULT_RENDERER_DIR,
      port: options.port,
      token: options.token,
    });
  } catch (error) {
    await workbench.close();
    throw error;
  }
  return {
    projectPath,
    shell,
    workbench,
    async close() {
      await shell.close();
      await workbench.close();
    },
  };
}

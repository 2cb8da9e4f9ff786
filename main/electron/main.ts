/**
 * Electron main process: the desktop host's composition root. Thin by design: it opens the project
 * through the services, serves the built renderer on a privileged app scheme, wires one IPC channel
 * per API method, and creates the locked-down window (window.ts, security.ts). No business logic.
 *
 * Usage: electron out/electron/main.js [project.slackline] [--read-only]   (npm start does this on the demo project;
 * --read-only opens that project read-only, docs/workbench.md "Read-only projects")
 */
import electron from 'electron';
import type { BrowserWindow as Window } from 'electron';
import { readFile } from 'node:fs/promises';
import { dirname, join, resolve } from 'node:path';
import { fileURLToPath } from 'node:url';
import { InputError } from '../../core/errors.js';
import { openWorkbenchSession, ensureDemoProject, type NewProjectPlacement, type WorkbenchSession } from '../services/compose.js';
import { createIpcHandlers } from './ipc.js';
import { createMainWindow, lockDownSession } from './window.js';
import { APP_SCHEME, DESKTOP_CSP, denyWindowOpen, guardNavigation, resolveAppFile } from './security.js';

const { app, BrowserWindow, ipcMain, protocol, dialog, Menu, session, shell } = electron;
const here = dirname(fileURLToPath(import.meta.url));
// Bundled to out/main/electron/main.js (scripts/build-desktop.mjs); the renderer is built to out/renderer.
const rendererDir = resolve(here, '..', '..', 'renderer');
const preloadPath = join(here, 'preload.cjs');

// Must run before 'ready': the app scheme behaves like https (secure, standard origin, fetch-able).
protocol.registerSchemesAsPrivileged([
  { scheme: APP_SCHEME, privileges: { standard: true, secure: true, supportFetchAPI: true, corsEnabled: true } },
]);

let opened: WorkbenchSession | null = null;
let mainWindow: Window | null = null;

/** New projects: the user picks the file in a save dialog (docs/workbench.md §New project); an existing file is refused. */
const savePlacement: NewProjectPlacement = {
  target: () => ({ kind: 'dialog' }),
  async choose(requested, projectName, currentPath) {
    if (requested !== undefined) throw new InputError('new project file', 'the desktop app asks where to save it in a dialog');
    const options = {
      title: 'Save the new Slackline project',
      defaultPath: join(dirname(currentPath), `${projectName.replace(/[^A-Za-z0-9 ._()+-]+/g, '_') || 'project'}.slackline`),
      filters: [{ name: 'Slackline project', extensions: ['slackline'] }],
      properties: ['createDirectory', 'showOverwriteConfirmation'] as ('createDirectory' | 'showOverwriteConfirmation')[],
    };
    const picked = mainWindow ? await dialog.showSaveDialog(mainWindow, options) : await dialog.showSaveDialog(options);
    return picked.canceled || !picked.filePath ? null : picked.filePath;
  },
};

async function openProject(path: string): Promise<void> {
  if (opened) await opened.switchTo(path);
  else opened = await openWorkbenchSession(path, savePlacement, { firstReadOnly: process.argv.includes('--read-only') });
}

function projectArgument(): string | null {
  const args = process.argv.slice(app.isPackaged ? 1 : 2).filter((a) => !a.startsWith('-'));
  return args[0] ? resolve(args[0]) : null;
}

async function chooseProject(window: Window): Promise<void> {
  const picked = await dialog.showOpenDialog(window, {
    title: 'Open a Slackline project',
    properties: ['openFile'],
    filters: [{ name: 'Slackline project', extensions: ['slackline'] }],
  });
  if (picked.canceled || !picked.filePaths[0]) return;
  try {
    await openProject(picked.filePaths[0]);
    window.webContents.reload();
  } catch (error) {
    dialog.showErrorBox('Could not open the project', error instanceof Error ? error.message : String(error));
  }
}

function buildMenu(window: Window): void {
  Menu.setApplicationMenu(Menu.buildFromTemplate([
    {
      label: 'File',
      submenu: [
        { label: 'Open Project…', accelerator: 'CmdOrCtrl+O', click: () => void chooseProject(window) },
        { type: 'separator' },
        { role: 'quit' },
      ],
    },
    { label: 'Edit', submenu: [{ role: 'undo' }, { role: 'redo' }, { type: 'separator' }, { role: 'cut' }, { role: 'copy' }, { role: 'paste' }, { role: 'selectAll' }] },
    { label: 'View', submenu: [{ role: 'resetZoom' }, { role: 'zoomIn' }, { role: 'zoomOut' }, { type: 'separator' }, { role: 'togglefullscreen' }, ...(app.isPackaged ? [] : [{ role: 'toggleDevTools' as const }])] },
  ]));
}

app.on('web-contents-created', (_event, contents) => {
  // Second line of defence for any web contents, not only the main window.
  contents.on('will-navigate', (event, url) => void guardNavigation(event, url));
  contents.on('will-redirect', (event, url) => void guardNavigation(event, url));
  contents.setWindowOpenHandler(denyWindowOpen);
});

app.whenReady().then(async () => {
  process.env.SLACKLINE_APP_ROOT = app.getAppPath();
  lockDownSession(session.defaultSession);
  protocol.handle(APP_SCHEME, async (request) => {
    const target = resolveAppFile(rendererDir, request.url);
    if (!target) return new Response('not found', { status: 404 });
    try {
      const body = await readFile(target.file);
      return new Response(body, {
        headers: { 'content-type': target.contentType, 'content-security-policy': DESKTOP_CSP, 'x-content-type-options': 'nosniff' },
      });
    } catch {
      return new Response('not found', { status: 404 });
    }
  });

  try {
    // Without a project argument the demo board opens (created in the temp folder the first time).
    await openProject(projectArgument() ?? ensureDemoProject());
  } catch (error) {
    dialog.showErrorBox('Could not open the project', error instanceof Error ? error.message : String(error));
    app.quit();
    return;
  }

  const host = {
    shell,
    // Only what the open project's latest report export wrote (docs/workbench.md, "Report files").
    revealable: () => opened?.current.api.latestExportedFiles() ?? [],
  };
  for (const [channel, handler] of createIpcHandlers(() => {
    if (!opened) throw new Error('no project is open');
    return opened.current.api;
  }, host)) {
    ipcMain.handle(channel, (event, ...args) => handler(event, ...args));
  }

  const window = createMainWindow({ BrowserWindow }, { preloadPath, packaged: app.isPackaged });
  mainWindow = window;
  buildMenu(window);
}).catch((error: unknown) => {
  console.error(error);
  app.exit(1);
});

app.on('window-all-closed', () => {
  void (opened?.close() ?? Promise.resolve()).finally(() => app.quit());
});

/**
 * Creates the workbench window and installs its guards. Electron is passed in (not imported) so the
 * test suite can hand it a recording fake and assert every setting without the Electron binary.
 */
import type { BrowserWindow, BrowserWindowConstructorOptions, Session } from 'electron';
import {
  APP_URL, buildWindowOptions, denyDevicePermission, denyDisplayMedia, denyPermissionCheck, denyPermissionRequest,
  denyWindowOpen, guardNavigation,
} from './security.js';

/** The parts of the electron module this function touches. */
export interface WindowElectron {
  BrowserWindow: new (options: BrowserWindowConstructorOptions) => BrowserWindow;
}

export interface WindowSetup {
  preloadPath: string;
  /** Defaults to the app-scheme index page. */
  url?: string;
  /** A packaged build (app.isPackaged): developer tools off. */
  packaged?: boolean;
}

/** Installs the deny-by-default permission handlers on a session (once per session). */
export function lockDownSession(
  session: Pick<Session, 'setPermissionRequestHandler' | 'setPermissionCheckHandler' | 'setDevicePermissionHandler' | 'setDisplayMediaRequestHandler'>,
): void {
  session.setPermissionRequestHandler(denyPermissionRequest);
  session.setPermissionCheckHandler(denyPermissionCheck);
  session.setDevicePermissionHandler(denyDevicePermission);
  session.setDisplayMediaRequestHandler(denyDisplayMedia);
}

export function createMainWindow(electron: WindowElectron, setup: WindowSetup): BrowserWindow {
  const window = new electron.BrowserWindow(buildWindowOptions(setup.preloadPath, { packaged: setup.packaged }));
  const contents = window.webContents;
  lockDownSession(contents.session);
  contents.on('will-navigate', (event, url) => {
    guardNavigation(event, url);
  });
  contents.on('will-redirect', (event, url) => {
    guardNavigation(event, url);
  });
  contents.on('will-attach-webview', (event) => event.preventDefault());
  contents.setWindowOpenHandler(denyWindowOpen);
  window.once('ready-to-show', () => window.show());
  void window.loadURL(setup.url ?? APP_URL);
  return window;
}

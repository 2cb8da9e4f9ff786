/**
 * The desktop window's security settings and guards, as pure values and functions so tests can assert
 * them without the Electron binary (this module never loads 'electron' at run time; types only).
 * Follows the Electron security checklist: isolated, sandboxed renderer without Node; a strict CSP;
 * no navigation away from the app, no new windows, no permissions; IPC only from the app's own frame.
 */
import type { BrowserWindowConstructorOptions, WebPreferences } from 'electron';
import { extname, join, normalize, resolve, sep } from 'node:path';

/** The renderer is served from this privileged custom scheme (a real origin, unlike file://). */
export const APP_SCHEME = 'slackline-app';
export const APP_HOST = 'workbench';
export const APP_ORIGIN = `${APP_SCHEME}://${APP_HOST}`;
export const APP_URL = `${APP_ORIGIN}/index.html`;

/** Sent as a header with every app file; renderer/index.html repeats it as a meta tag. */
export const DESKTOP_CSP = [
  "default-src 'none'",
  "script-src 'self'",
  "style-src 'self'",
  "img-src 'self' data:",
  "font-src 'self'",
  "connect-src 'none'",
  "base-uri 'none'",
  "form-action 'none'",
  "frame-ancestors 'none'",
].join('; ');

/** How the app runs: a packaged build (electron-builder) gets no developer tools. */
export interface HostMode {
  packaged?: boolean;
}

export function buildWebPreferences(preloadPath: string, mode: HostMode = {}): WebPreferences {
  return {
    preload: preloadPath,
    contextIsolation: true,
    sandbox: true,
    nodeIntegration: false,
    nodeIntegrationInWorker: false,
    nodeIntegrationInSubFrames: false,
    webSecurity: true,
    allowRunningInsecureContent: false,
    experimentalFeatures: false,
    webviewTag: false,
    navigateOnDragDrop: false,
    spellcheck: false,
    // Developer tools only when run from the checkout; a packaged build never opens them.
    devTools: mode.packaged !== true,
  };
}

export function buildWindowOptions(preloadPath: string, mode: HostMode = {}): BrowserWindowConstructorOptions {
  return {
    width: 1440,
    height: 900,
    minWidth: 960,
    minHeight: 600,
    title: 'Slackline',
    show: false,
    backgroundColor: '#f7f7f5',
    webPreferences: buildWebPreferences(preloadPath, mode),
  };
}

/** True when `target` stays inside the app's own origin (the only place the window may go). */
export function isAppUrl(target: string): boolean {
  try {
    const url = new URL(target);
    return url.protocol === `${APP_SCHEME}:` && url.host === APP_HOST;
  } catch {
    return false;
  }
}

/** will-navigate / will-redirect: block anything leaving the app's origin. */
export function guardNavigation(event: { preventDefault(): void }, target: string): boolean {
  if (isAppUrl(target)) return true;
  event.preventDefault();
  return false;
}

/** setWindowOpenHandler: no new windows, ever (links to the outside are not offered by the app). */
export function denyWindowOpen(): { action: 'deny' } {
  return { action: 'deny' };
}

/** setPermissionRequestHandler: the workbench needs no camera, notifications, geolocation... */
export function denyPermissionRequest(
  _webContents: unknown,
  _permission: string,
  callback: (granted: boolean) => void,
): void {
  callback(false);
}

/** setPermissionCheckHandler: same answer for synchronous checks. */
export function denyPermissionCheck(): boolean {
  return false;
}

/** setDevicePermissionHandler: no HID, serial or USB device is ever granted without asking (or at all). */
export function denyDevicePermission(): boolean {
  return false;
}

/** setDisplayMediaRequestHandler: screen capture is refused (a callback with no stream denies the request). */
export function denyDisplayMedia(_request: unknown, callback: (streams: Record<string, never>) => void): void {
  callback({});
}

/** IPC is accepted only from the app's own top frame (not from an iframe or a foreign page). */
export function isTrustedSender(frame: { url: string; parent?: unknown } | null | undefined): boolean {
  if (!frame) return false;
  if (frame.parent) return false;
  return isAppUrl(frame.url);
}

const APP_CONTENT_TYPES: Record<string, string> = {
  '.html': 'text/html; charset=utf-8',
  '.js': 'text/javascript; charset=utf-8',
  '.css': 'text/css; charset=utf-8',
  '.svg': 'image/svg+xml',
  '.png': 'image/png',
  '.woff2': 'font/woff2',
};

/**
 * Maps an app-scheme request URL to a file inside the built renderer, or null when it is not the
 * app's origin or would escape the folder (../, encoded separators).
 */
export function resolveAppFile(rendererDir: string, requestUrl: string): { file: string; contentType: string } | null {
  if (!isAppUrl(requestUrl)) return null;
  let path: string;
  try {
    path = decodeURIComponent(new URL(requestUrl).pathname);
  } catch {
    return null;
  }
  if (path.includes('\0')) return null;
  if (path === '/' || path === '') path = '/index.html';
  const root = resolve(rendererDir);
  const file = normalize(join(root, path));
  if (!file.startsWith(root + sep)) return null;
  const contentType = APP_CONTENT_TYPES[extname(file).toLowerCase()];
  if (!contentType) return null;
  return { file, contentType };
}

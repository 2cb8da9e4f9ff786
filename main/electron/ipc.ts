/**
 * IPC wiring between the preload and the service API, as pure functions (testable without Electron).
 * One channel per API method, all under one prefix; each handler first checks that the message comes
 * from the app's own frame, then validates the payload with the method's zod schema (dispatch.ts).
 */
import type { SlacklineApi } from '../../core/contract/api.js';
import { API_METHODS } from '../../core/contract/methods.js';
import type { ApiOutcome } from '../../core/contract/transport.js';
import { dispatchApiCall } from '../services/api/dispatch.js';
import { isAbsolute, resolve } from 'node:path';
import { isTrustedSender } from './security.js';
import { channelOf, HOST_CHANNELS } from './channels.js';

export { channelOf, IPC_PREFIX, HOST_CHANNELS, HOST_PREFIX } from './channels.js';

/** The part of Electron's IpcMainInvokeEvent a handler looks at. */
export interface InvokeEventLike {
  senderFrame: { url: string; parent?: unknown } | null;
}

export type IpcHandler = (event: InvokeEventLike, ...args: unknown[]) => Promise<ApiOutcome>;

/**
 * Handlers for every API method, keyed by channel. `getApi` is read on each call so the host can swap
 * projects (File > Open) without re-registering channels.
 */
/**
 * What the desktop host lends the window beyond the service API (channels.ts HOST_CHANNELS): Electron's
 * shell, narrowed to the one call used, and the files the latest export wrote (the only ones it may reveal).
 */
export interface HostCapabilities {
  shell: { showItemInFolder(fullPath: string): void };
  revealable(): readonly string[];
}

/** Longest path accepted from the window (PATH_MAX on Linux; common practice, no source). */
const MAX_PATH_CHARS = 4096;

const refused = (message: string): ApiOutcome => ({ ok: false, error: { kind: 'refused', message, where: null } });

/**
 * showInFolder(path): one argument, an absolute path without NUL of at most MAX_PATH_CHARS, and one of
 * the files the latest export wrote (compared resolved); anything else is refused and the shell is not
 * called (docs/workbench.md, "Report files").
 */
export function createShowInFolderHandler(host: HostCapabilities): IpcHandler {
  return async (event, ...args) => {
    if (!isTrustedSender(event.senderFrame)) return refused('showInFolder refused: it does not come from the workbench frame');
    const [path] = args;
    if (args.length !== 1 || typeof path !== 'string' || path.length === 0 || path.length > MAX_PATH_CHARS || path.includes('\0') || !isAbsolute(path)) {
      return { ok: false, error: { kind: 'payload', message: 'showInFolder takes one absolute file path', where: null } };
    }
    const target = resolve(path);
    if (!host.revealable().includes(target)) return refused(`showInFolder refused: ${target} is not a file the latest report export wrote`);
    host.shell.showItemInFolder(target);
    return { ok: true, value: null };
  };
}

/** `host`: the desktop's own channels (HOST_CHANNELS) besides the API's; absent, only the API's. */
export function createIpcHandlers(getApi: () => SlacklineApi, host?: HostCapabilities): Map<string, IpcHandler> {
  const handlers = new Map<string, IpcHandler>();
  if (host) handlers.set(HOST_CHANNELS.showInFolder, createShowInFolderHandler(host));
  for (const method of API_METHODS) {
    handlers.set(channelOf(method), async (event, ...args) => {
      if (!isTrustedSender(event.senderFrame)) {
        return {
          ok: false,
          error: { kind: 'refused', message: `IPC call ${method} refused: it does not come from the workbench frame`, where: null },
        };
      }
      return dispatchApiCall(getApi(), method, args);
    });
  }
  return handlers;
}

/**
 * IPC wiring between the preload and the service API, as pure functions (testable without Electron).
 * One channel per API method, all under one prefix; each handler first checks that the message comes
 * from the app's own frame, then validates the payload with the method's zod schema (dispatch.ts).
 */
import type { SlacklineApi } from '../../core/contract/api.js';
import { API_METHODS } from '../../core/contract/methods.js';
import type { ApiOutcome } from '../../core/contract/transport.js';
import { dispatchApiCall } from '../services/api/dispatch.js';
import { isTrustedSender } from './security.js';
import { channelOf } from './channels.js';

export { channelOf, IPC_PREFIX } from './channels.js';

/** The part of Electron's IpcMainInvokeEvent a handler looks at. */
export interface InvokeEventLike {
  senderFrame: { url: string; parent?: unknown } | null;
}

export type IpcHandler = (event: InvokeEventLike, ...args: unknown[]) => Promise<ApiOutcome>;

/**
 * Handlers for every API method, keyed by channel. `getApi` is read on each call so the host can swap
 * projects (File > Open) without re-registering channels.
 */
export function createIpcHandlers(getApi: () => SlacklineApi): Map<string, IpcHandler> {
  const handlers = new Map<string, IpcHandler>();
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

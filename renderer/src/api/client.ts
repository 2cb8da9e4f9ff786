/**
 * The renderer's handle on the application: a SlacklineApi over whichever transport this page runs
 * on. In the desktop app the preload exposes `window.slackline` (IPC); in a browser opened from the
 * loopback shell, calls go to POST /api/<method> with the per-run token from the start URL.
 * Only Pinia stores import this module; components call store actions.
 */
import type { SlacklineApi } from '../../../core/contract/api.js';
import { API_METHODS } from '../../../core/contract/methods.js';
import type { ApiFailure, ApiOutcome, SlacklineBridge, SlacklineHostBridge } from '../../../core/contract/transport.js';

/** A failed call, with the service's words and where the problem is. */
export class ApiError extends Error {
  readonly kind: ApiFailure['kind'];
  readonly where: string | null;
  constructor(failure: ApiFailure) {
    super(failure.message);
    this.name = 'ApiError';
    this.kind = failure.kind;
    this.where = failure.where;
  }
}

const TOKEN_KEY = 'slackline.token';
const TOKEN_HEADER = 'x-slackline-token';

/** Reads the token from ?token= once, keeps it for this tab, and removes it from the address bar. */
function takeToken(): string | null {
  const url = new URL(window.location.href);
  const fromUrl = url.searchParams.get('token');
  if (fromUrl) {
    sessionStorage.setItem(TOKEN_KEY, fromUrl);
    url.searchParams.delete('token');
    history.replaceState(history.state, '', url.pathname + url.search + url.hash);
    return fromUrl;
  }
  return sessionStorage.getItem(TOKEN_KEY);
}

function unwrap(outcome: ApiOutcome): unknown {
  if (outcome.ok) return outcome.value;
  throw new ApiError(outcome.error);
}

function overBridge(bridge: SlacklineBridge): SlacklineApi {
  const api: Record<string, unknown> = {};
  for (const method of API_METHODS) {
    api[method] = async (...args: unknown[]) => unwrap(await bridge[method](...args));
  }
  return api as unknown as SlacklineApi;
}

function overHttp(token: string | null): SlacklineApi {
  const api: Record<string, unknown> = {};
  for (const method of API_METHODS) {
    api[method] = async (...args: unknown[]) => {
      let response: Response;
      try {
        response = await fetch(`./api/${method}`, {
          method: 'POST',
          headers: { 'content-type': 'application/json', [TOKEN_HEADER]: token ?? '' },
          body: JSON.stringify(args),
        });
      } catch {
        throw new ApiError({ kind: 'internal', message: 'the workbench server does not answer (was it stopped?)', where: null });
      }
      const body = (await response.json().catch(() => null)) as { value?: unknown; error?: ApiFailure } | null;
      if (response.status === 401) {
        throw new ApiError({
          kind: 'unauthorized',
          message: 'this page has no valid access token: open the address the server printed (it ends in ?token=…)',
          where: null,
        });
      }
      if (!body) throw new ApiError({ kind: 'internal', message: `server answered ${response.status} without a readable body`, where: null });
      if (body.error) throw new ApiError(body.error);
      return body.value ?? null;
    };
  }
  return api as unknown as SlacklineApi;
}

let instance: SlacklineApi | null = null;

export function api(): SlacklineApi {
  if (!instance) {
    const bridge = (window as unknown as { slackline?: SlacklineBridge }).slackline;
    instance = bridge ? overBridge(bridge) : overHttp(takeToken());
  }
  return instance;
}

/**
 * The desktop host's own capabilities (the preload's `window.slacklineHost`), or null in a browser,
 * which offers downloads instead. Each call throws the host's refusal as an ApiError.
 */
export function hostCapabilities(): { showInFolder(path: string): Promise<void> } | null {
  const host = (window as unknown as { slacklineHost?: SlacklineHostBridge }).slacklineHost;
  if (!host) return null;
  return { showInFolder: async (path) => void unwrap(await host.showInFolder(path)) };
}

/** Which transport the page runs on (shown in the status bar). */
export function transportName(): 'desktop' | 'browser' {
  return (window as unknown as { slackline?: unknown }).slackline ? 'desktop' : 'browser';
}

export { messageOf } from '../lib/errors.js';

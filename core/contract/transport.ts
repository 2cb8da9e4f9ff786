/**
 * How a call's outcome travels over a transport (Electron IPC, HTTP JSON). Failures keep their kind
 * and, for bad input, where the problem is, so the renderer can show them next to the field.
 */
export interface ApiFailure {
  kind: 'input' | 'payload' | 'unknown-method' | 'internal' | 'unauthorized' | 'refused';
  message: string;
  /** Where the problem is (InputError.where), when known. */
  where: string | null;
}

export type ApiOutcome = { ok: true; value: unknown } | { ok: false; error: ApiFailure };

/**
 * What the Electron preload exposes as `window.slackline`: one function per API method, each
 * resolving to an outcome (never rejecting with a bare Error, which would lose `kind` and `where`).
 */
export type SlacklineBridge = Record<import('./api.js').ApiMethod, (...args: unknown[]) => Promise<ApiOutcome>>;

/**
 * What the desktop preload exposes as `window.slacklineHost`: capabilities of the desktop host that
 * are not part of the service API (a browser page has none of them). showInFolder reveals a file the
 * latest report export wrote in the system's file manager; any other path is refused.
 */
export interface SlacklineHostBridge {
  showInFolder(path: string): Promise<ApiOutcome>;
}

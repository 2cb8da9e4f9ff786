/** IPC channel names: one per API method, all under one prefix (shared by preload and main). */
export const IPC_PREFIX = 'slackline:';

export function channelOf(method: string): string {
  return `${IPC_PREFIX}${method}`;
}

/**
 * Desktop-only capabilities outside the service API, each on its own channel under its own prefix
 * (never an API method: the browser shell has no such thing). The allow-list is this object.
 */
export const HOST_PREFIX = 'slackline-host:';
export const HOST_CHANNELS = {
  /** Reveal a report file the last export wrote in the system's file manager (docs/workbench.md, "Report files"). */
  showInFolder: `${HOST_PREFIX}showInFolder`,
} as const;

/** IPC channel names: one per API method, all under one prefix (shared by preload and main). */
export const IPC_PREFIX = 'slackline:';

export function channelOf(method: string): string {
  return `${IPC_PREFIX}${method}`;
}

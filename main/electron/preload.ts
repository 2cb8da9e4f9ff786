/**
 * Preload (runs sandboxed, isolated from the page). Exposes `window.slackline`: one function per API
 * method, each forwarding its arguments on that method's own channel. ipcRenderer itself never
 * reaches the page, so a compromised page can call the typed API and nothing else. `window.slacklineHost`
 * adds the desktop's own capabilities (showInFolder), each on its allow-listed channel.
 */
import { contextBridge, ipcRenderer } from 'electron';
import { API_METHODS } from '../../core/contract/methods.js';
import type { ApiOutcome, SlacklineBridge, SlacklineHostBridge } from '../../core/contract/transport.js';
import { channelOf, HOST_CHANNELS } from './channels.js';

export function buildBridge(invoke: (channel: string, ...args: unknown[]) => Promise<unknown>): SlacklineBridge {
  const bridge = {} as SlacklineBridge;
  for (const method of API_METHODS) {
    bridge[method] = (...args: unknown[]) => invoke(channelOf(method), ...args) as Promise<ApiOutcome>;
  }
  return Object.freeze(bridge);
}

/** The desktop host's own capabilities (channels.ts HOST_CHANNELS): one function each, one string argument. */
export function buildHostBridge(invoke: (channel: string, ...args: unknown[]) => Promise<unknown>): SlacklineHostBridge {
  return Object.freeze({
    showInFolder: (path: string) => invoke(HOST_CHANNELS.showInFolder, String(path)) as Promise<ApiOutcome>,
  });
}

contextBridge.exposeInMainWorld('slackline', buildBridge((channel, ...args) => ipcRenderer.invoke(channel, ...args)));
contextBridge.exposeInMainWorld('slacklineHost', buildHostBridge((channel, ...args) => ipcRenderer.invoke(channel, ...args)));

/**
 * Preload (runs sandboxed, isolated from the page). Exposes `window.slackline`: one function per API
 * method, each forwarding its arguments on that method's own channel. ipcRenderer itself never
 * reaches the page, so a compromised page can call the typed API and nothing else.
 */
import { contextBridge, ipcRenderer } from 'electron';
import { API_METHODS } from '../../core/contract/methods.js';
import type { ApiOutcome, SlacklineBridge } from '../../core/contract/transport.js';
import { channelOf } from './channels.js';

export function buildBridge(invoke: (channel: string, ...args: unknown[]) => Promise<unknown>): SlacklineBridge {
  const bridge = {} as SlacklineBridge;
  for (const method of API_METHODS) {
    bridge[method] = (...args: unknown[]) => invoke(channelOf(method), ...args) as Promise<ApiOutcome>;
  }
  return Object.freeze(bridge);
}

contextBridge.exposeInMainWorld('slackline', buildBridge((channel, ...args) => ipcRenderer.invoke(channel, ...args)));

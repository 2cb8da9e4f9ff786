/**
 * "Show in folder" after a report export in the desktop app (docs/workbench.md, "Report files"): the
 * host's own IPC channel (channels.ts HOST_CHANNELS), tested with a recording fake of Electron's shell
 * (the Electron binary is not installed on build machines). Only the app's top frame may call it, with
 * one absolute path, and only for a file the latest export wrote; the sender check comes first, as for
 * every API channel (Electron security checklist, "Validate the sender of all IPC messages").
 */
import { describe, expect, it } from 'vitest';
import { join, resolve } from 'node:path';
import { tmpdir } from 'node:os';
import { createIpcHandlers, createShowInFolderHandler, HOST_CHANNELS, HOST_PREFIX, IPC_PREFIX, type HostCapabilities } from '../../main/electron/ipc.js';
import { APP_URL } from '../../main/electron/security.js';
import { AppService } from '../../main/services/api/app-service.js';

const fromApp = { senderFrame: { url: APP_URL, parent: null } };

function fakeHost(files: string[]): HostCapabilities & { revealed: string[] } {
  const revealed: string[] = [];
  return { revealed, shell: { showItemInFolder: (path) => void revealed.push(path) }, revealable: () => files };
}

describe('the showInFolder host channel', () => {
  const written = [join(tmpdir(), 'demo-reports', 'margins.pdf'), join(tmpdir(), 'demo-reports', 'margins.csv')];

  it('reveals a file the latest export wrote, by its resolved path', async () => {
    const host = fakeHost(written);
    const handler = createShowInFolderHandler(host);
    expect(await handler(fromApp, written[0])).toEqual({ ok: true, value: null });
    // The same file named with a detour resolves to the written one (node:path resolve).
    expect(await handler(fromApp, join(tmpdir(), 'demo-reports', '..', 'demo-reports', 'margins.csv'))).toEqual({ ok: true, value: null });
    expect(host.revealed).toEqual(written);
  });

  it('refuses any other path, a malformed argument and a foreign sender without calling the shell', async () => {
    const host = fakeHost(written);
    const handler = createShowInFolderHandler(host);
    const refusals: [string, unknown, unknown[], string][] = [
      ['another file in the same folder', fromApp, [join(tmpdir(), 'demo-reports', 'other.pdf')], 'refused'],
      ['the folder itself', fromApp, [join(tmpdir(), 'demo-reports')], 'refused'],
      ['a relative path', fromApp, ['demo-reports/margins.pdf'], 'payload'],
      ['a path with NUL', fromApp, [`${written[0]}\0.txt`], 'payload'],
      ['a very long path', fromApp, [`/${'a'.repeat(5000)}`], 'payload'],
      ['no argument', fromApp, [], 'payload'],
      ['two arguments', fromApp, [written[0], written[1]], 'payload'],
      ['an object', fromApp, [{ toString: () => written[0] }], 'payload'],
      ['a foreign page', { senderFrame: { url: 'https://example.com/' } }, [written[0]], 'refused'],
      ['a sub-frame of the app', { senderFrame: { url: APP_URL, parent: { url: APP_URL } } }, [written[0]], 'refused'],
      ['no frame', { senderFrame: null }, [written[0]], 'refused'],
    ];
    for (const [what, event, args, kind] of refusals) {
      const outcome = await handler(event as typeof fromApp, ...args);
      expect(outcome.ok, what).toBe(false);
      if (!outcome.ok) expect(outcome.error.kind, what).toBe(kind);
    }
    expect(host.revealed).toEqual([]); // common practice, no source: a refused call has no effect
  });

  it('is registered with the API channels only when the host lends it, under its own prefix', () => {
    const api = {} as never;
    expect(createIpcHandlers(() => api).has(HOST_CHANNELS.showInFolder)).toBe(false);
    const handlers = createIpcHandlers(() => api, fakeHost([]));
    expect(handlers.has(HOST_CHANNELS.showInFolder)).toBe(true);
    expect(HOST_CHANNELS.showInFolder.startsWith(HOST_PREFIX)).toBe(true);
    expect(HOST_PREFIX.startsWith(IPC_PREFIX)).toBe(false); // never mistaken for an API method's channel
  });

  it('may reveal exactly the files of the latest export of AppService, nothing from an earlier one', async () => {
    let next: string[] = [];
    // The service's other ports are not used by exportReport (app-service.ts).
    const api = new AppService({ project: {} as never, solve: {} as never, layerProperties: () => [], exportReport: async () => ({ files: next }) });
    const host = fakeHost([]);
    const handler = createShowInFolderHandler({ shell: host.shell, revealable: () => api.latestExportedFiles() });
    expect(api.latestExportedFiles()).toEqual([]);
    next = [written[0]];
    await api.exportReport({ formats: ['pdf'] });
    expect((await handler(fromApp, written[0])).ok).toBe(true);
    next = [written[1]];
    await api.exportReport({ formats: ['csv'] });
    expect((await handler(fromApp, written[0])).ok).toBe(false); // written by the export before
    expect((await handler(fromApp, written[1])).ok).toBe(true);
    expect(host.revealed).toEqual([resolve(written[0]), resolve(written[1])]);
  });
});

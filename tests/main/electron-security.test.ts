/**
 * The desktop window's security settings, asserted from the code that creates the window and wires
 * IPC. Electron's binary is not installed on build machines, so window.ts receives a recording fake
 * BrowserWindow and the preload is loaded with 'electron' mocked. Source for every expectation: the
 * Electron security checklist (electronjs.org/docs/latest/tutorial/security), as summarised in
 * docs/design.md §7.1.
 */
import { describe, expect, it, vi } from 'vitest';
import { readFileSync, readdirSync, mkdtempSync, mkdirSync, writeFileSync, rmSync } from 'node:fs';
import { join } from 'node:path';
import { tmpdir } from 'node:os';
import type { BrowserWindowConstructorOptions } from 'electron';
import type { SlacklineApi } from '../../core/contract/api.js';
import { API_METHODS } from '../../core/contract/methods.js';
import {
  APP_URL, APP_ORIGIN, DESKTOP_CSP, buildWindowOptions, isTrustedSender, resolveAppFile,
} from '../../main/electron/security.js';
import { createMainWindow } from '../../main/electron/window.js';
import { createIpcHandlers, channelOf, IPC_PREFIX, HOST_CHANNELS } from '../../main/electron/ipc.js';
import { sqliteNativeBinding, ELECTRON_SQLITE_BINDING } from '../../main/services/db/native-binding.js';

const electronContents = vi.hoisted(() => ({
  exposed: [] as [string, unknown][],
  invoked: [] as unknown[][],
  handles: new Map<string, (...args: unknown[]) => Promise<unknown>>(),
  appEvents: new Map<string, (...args: unknown[]) => void>(),
  protocol: null as null | ((request: { url: string }) => Promise<Response>),
  schemes: [] as unknown[],
  windows: [] as { options: Record<string, unknown>; loaded: string[] }[],
  dialogs: [] as string[],
  revealed: [] as string[],
  quit: false,
}));
vi.mock('electron', () => {
  const record = electronContents;
  const session = { setPermissionRequestHandler: () => {}, setPermissionCheckHandler: () => {}, setDevicePermissionHandler: () => {}, setDisplayMediaRequestHandler: () => {} };
  class BrowserWindow {
    loaded: string[] = [];
    webContents = { session, on: () => {}, setWindowOpenHandler: () => {}, reload: () => {} };
    constructor(public options: Record<string, unknown>) { record.windows.push(this); }
    once() {}
    loadURL(url: string) { this.loaded.push(url); return Promise.resolve(); }
    show() {}
  }
  const electron = {
    contextBridge: { exposeInMainWorld: (key: string, value: unknown) => record.exposed.push([key, value]) },
    ipcRenderer: { invoke: async (...args: unknown[]) => { record.invoked.push(args); return { ok: true, value: null }; } },
    app: {
      isPackaged: false,
      getAppPath: () => process.cwd(),
      whenReady: () => Promise.resolve(),
      on: (event: string, handler: (...args: unknown[]) => void) => { record.appEvents.set(event, handler); },
      quit: () => { record.quit = true; },
      exit: () => { record.quit = true; },
    },
    BrowserWindow,
    session: { defaultSession: session },
    ipcMain: { handle: (channel: string, handler: (...args: unknown[]) => Promise<unknown>) => record.handles.set(channel, handler) },
    protocol: {
      registerSchemesAsPrivileged: (schemes: unknown[]) => record.schemes.push(...schemes),
      handle: (_scheme: string, handler: typeof record.protocol) => { record.protocol = handler; },
    },
    dialog: { showErrorBox: (title: string, message: string) => record.dialogs.push(`${title}: ${message}`), showOpenDialog: async () => ({ canceled: true, filePaths: [] }) },
    Menu: { setApplicationMenu: () => {}, buildFromTemplate: (template: unknown) => template },
    shell: { showItemInFolder: (path: string) => record.revealed.push(path) },
  };
  return { ...electron, default: electron };
});

/** A BrowserWindow stand-in that records what window.ts does to it. */
function fakeElectron() {
  const record = {
    options: null as BrowserWindowConstructorOptions | null,
    events: new Map<string, (...args: unknown[]) => void>(),
    windowOpen: null as null | ((details: unknown) => { action: string }),
    permissionRequest: null as null | ((wc: unknown, permission: string, callback: (ok: boolean) => void) => void),
    permissionCheck: null as null | ((...args: unknown[]) => boolean),
    devicePermission: null as null | ((details: unknown) => boolean),
    displayMedia: null as null | ((request: unknown, callback: (streams: unknown) => void) => void),
    loaded: [] as string[],
  };
  class BrowserWindow {
    webContents = {
      session: {
        setPermissionRequestHandler: (h: typeof record.permissionRequest) => { record.permissionRequest = h; },
        setPermissionCheckHandler: (h: typeof record.permissionCheck) => { record.permissionCheck = h; },
        setDevicePermissionHandler: (h: typeof record.devicePermission) => { record.devicePermission = h; },
        setDisplayMediaRequestHandler: (h: typeof record.displayMedia) => { record.displayMedia = h; },
      },
      on: (event: string, handler: (...args: unknown[]) => void) => { record.events.set(event, handler); },
      setWindowOpenHandler: (h: typeof record.windowOpen) => { record.windowOpen = h; },
    };
    constructor(options: BrowserWindowConstructorOptions) { record.options = options; }
    once() { /* ready-to-show */ }
    loadURL(url: string) { record.loaded.push(url); return Promise.resolve(); }
    show() { /* not needed */ }
  }
  return { electron: { BrowserWindow } as never, record };
}

function navigationEvent() {
  const event = { prevented: false, preventDefault() { event.prevented = true; } };
  return event;
}

describe('the workbench window', () => {
  const { electron, record } = fakeElectron();
  createMainWindow(electron, { preloadPath: '/app/out/electron/preload.cjs' });
  const prefs = record.options?.webPreferences ?? {};

  it('isolates and sandboxes the renderer, without Node', () => {
    expect(prefs.contextIsolation).toBe(true);
    expect(prefs.sandbox).toBe(true);
    expect(prefs.nodeIntegration).toBe(false);
    expect(prefs.nodeIntegrationInWorker).toBe(false);
    expect(prefs.nodeIntegrationInSubFrames).toBe(false);
    expect(prefs.webviewTag).toBe(false);
    expect(prefs.preload).toBe('/app/out/electron/preload.cjs');
  });

  it('keeps web security on and no experimental or insecure switches', () => {
    expect(prefs.webSecurity).not.toBe(false);
    expect(prefs.allowRunningInsecureContent).not.toBe(true);
    expect(prefs.experimentalFeatures).not.toBe(true);
    expect(prefs).not.toHaveProperty('enableBlinkFeatures');
    expect(buildWindowOptions('/app/out/electron/preload.cjs').webPreferences).toEqual(prefs);
  });

  it('loads only the app page, from the app scheme (no remote content)', () => {
    expect(record.loaded).toEqual([APP_URL]);
    expect(APP_URL.startsWith(`${APP_ORIGIN}/`)).toBe(true);
  });

  it('denies every permission request and check', () => {
    for (const permission of ['media', 'geolocation', 'notifications', 'clipboard-read', 'openExternal']) {
      let answer: boolean | null = null;
      record.permissionRequest?.({}, permission, (ok) => { answer = ok; });
      expect(answer, permission).toBe(false);
    }
    expect(record.permissionCheck?.({}, 'media', 'https://x', {})).toBe(false);
  });

  it('denies device permissions (HID, serial, USB) and display-media (screen capture) requests', () => {
    // Electron security checklist item "Handle session permission requests"; these two handlers are
    // separate from the permission request handler (electron.d.ts, Session).
    for (const deviceType of ['hid', 'serial', 'usb']) {
      expect(record.devicePermission?.({ deviceType, origin: APP_ORIGIN, device: {} }), deviceType).toBe(false);
    }
    let streams: unknown = 'not called';
    record.displayMedia?.({ frame: null, securityOrigin: APP_ORIGIN, videoRequested: true, audioRequested: true }, (s) => { streams = s; });
    expect(streams).toEqual({}); // no video, no audio: the request is denied
  });

  it('turns developer tools off in a packaged build (on only when run from the checkout)', () => {
    expect(buildWindowOptions('/p.cjs', { packaged: true }).webPreferences?.devTools).toBe(false);
    expect(buildWindowOptions('/p.cjs', { packaged: false }).webPreferences?.devTools).toBe(true);
    const packaged = fakeElectron();
    createMainWindow(packaged.electron, { preloadPath: '/p.cjs', packaged: true });
    expect(packaged.record.options?.webPreferences?.devTools).toBe(false);
  });

  it('blocks navigation and redirects away from the app origin', () => {
    for (const kind of ['will-navigate', 'will-redirect']) {
      const handler = record.events.get(kind);
      expect(handler, kind).toBeTypeOf('function');
      for (const target of ['https://example.com/', 'file:///etc/passwd', 'http://127.0.0.1:8080/', 'slackline-app://other/index.html', 'javascript:alert(1)']) {
        const event = navigationEvent();
        handler?.(event, target);
        expect(event.prevented, `${kind} ${target}`).toBe(true);
      }
      const inside = navigationEvent();
      handler?.(inside, `${APP_ORIGIN}/index.html#/bus/DATA0`);
      expect(inside.prevented).toBe(false);
    }
    const attach = navigationEvent();
    record.events.get('will-attach-webview')?.(attach);
    expect(attach.prevented).toBe(true);
  });

  it('opens no new windows', () => {
    expect(record.windowOpen?.({ url: 'https://example.com' })).toEqual({ action: 'deny' });
    expect(record.windowOpen?.({ url: APP_URL })).toEqual({ action: 'deny' });
  });
});

describe('the content security policy', () => {
  const html = readFileSync(join(__dirname, '..', '..', 'renderer', 'index.html'), 'utf8');
  const meta = /http-equiv="Content-Security-Policy"\s+content="([^"]+)"/.exec(html)?.[1] ?? '';

  it('is set in the page and by the app scheme, scripts from the app only', () => {
    for (const policy of [meta, DESKTOP_CSP]) {
      expect(policy).toContain("default-src 'none'");
      expect(policy).toMatch(/script-src 'self'(;|$)/);
      expect(policy).not.toMatch(/unsafe-inline|unsafe-eval|\*|https?:/);
      expect(policy).toContain("base-uri 'none'");
    }
  });

  it('has no inline script in the page', () => {
    expect(html).not.toMatch(/<script(?![^>]*\bsrc=)[^>]*>/);
  });
});

describe('the app scheme file handler', () => {
  const root = mkdtempSync(join(tmpdir(), 'slackline-app-'));
  mkdirSync(join(root, 'assets'));
  writeFileSync(join(root, 'index.html'), '');

  it('maps app URLs into the renderer folder and nothing else', () => {
    expect(resolveAppFile(root, `${APP_ORIGIN}/index.html`)?.file).toBe(join(root, 'index.html'));
    expect(resolveAppFile(root, `${APP_ORIGIN}/assets/a.js`)?.contentType).toContain('javascript');
    for (const url of [
      `${APP_ORIGIN}/../package.json`, `${APP_ORIGIN}/%2e%2e/package.json`, `${APP_ORIGIN}/assets/..%2f..%2fsecret.js`,
      'https://example.com/index.html', `${APP_ORIGIN}/data.bin`,
    ]) {
      const hit = resolveAppFile(root, url);
      expect(hit === null || hit.file.startsWith(root), url).toBe(true);
      if (url.includes('..') || !url.startsWith(APP_ORIGIN) || url.endsWith('.bin')) expect(hit, url).toBeNull();
    }
    rmSync(root, { recursive: true, force: true });
  });
});

describe('IPC', () => {
  const calls: { method: string; args: unknown[] }[] = [];
  const api = Object.fromEntries(API_METHODS.map((m) => [m, async (...args: unknown[]) => { calls.push({ method: m, args }); return `${m} ok`; }])) as unknown as SlacklineApi;
  const handlers = createIpcHandlers(() => api);
  const fromApp = { senderFrame: { url: APP_URL, parent: null } };

  it('has one channel per API method, under one prefix', () => {
    expect([...handlers.keys()].sort()).toEqual(API_METHODS.map(channelOf).sort());
    for (const channel of handlers.keys()) expect(channel.startsWith(IPC_PREFIX)).toBe(true);
  });

  it('refuses calls from any frame but the app\'s top frame, before the service sees them', async () => {
    calls.length = 0;
    const handler = handlers.get(channelOf('getProject'))!;
    for (const senderFrame of [null, { url: 'https://example.com/' }, { url: 'file:///tmp/x.html' }, { url: APP_URL, parent: { url: APP_URL } }]) {
      const outcome = await handler({ senderFrame });
      expect(outcome.ok).toBe(false);
      if (!outcome.ok) expect(outcome.error.kind).toBe('refused');
    }
    expect(isTrustedSender({ url: `${APP_ORIGIN}/index.html#/net/DQ1` })).toBe(true);
    expect(calls).toEqual([]);
  });

  it('runs the sender check on every channel, not only one', async () => {
    calls.length = 0;
    const foreign = [null, { url: 'https://example.com/' }, { url: APP_URL, parent: { url: APP_URL } }];
    for (const [channel, handler] of handlers) {
      for (const senderFrame of foreign) {
        const outcome = await handler({ senderFrame });
        expect(outcome.ok, `${channel} from ${JSON.stringify(senderFrame)}`).toBe(false);
        if (!outcome.ok) expect(outcome.error.kind, channel).toBe('refused');
      }
    }
    expect(calls).toEqual([]); // no service method saw any of them
  });

  it('validates every payload against its method\'s schema', async () => {
    calls.length = 0;
    const bad: [string, unknown[]][] = [
      ['getNetWaveforms', [{ toString: 'x' }]],
      ['updateNetElement', ['DQ1', -1, { kind: 'resistor', a: 'a', b: 'b', ohms: 33 }]],
      ['updateNetElement', ['DQ1', 0, { kind: 'resistor', a: 'a', b: 'b', ohms: 0 }]],
      ['previewImport', ['lengths.csv']],
      ['upsertPart', [{ name: 'X' }]],
      ['startSolve', ['everything']],
    ];
    for (const [method, args] of bad) {
      const outcome = await handlers.get(channelOf(method))!(fromApp, ...args);
      expect(outcome.ok, method).toBe(false);
      if (!outcome.ok) expect(outcome.error.kind, method).toBe('payload');
    }
    expect(calls).toEqual([]);
    const good = await handlers.get(channelOf('updateNetElement'))!(fromApp, 'DQ1', 2, { kind: 'resistor', a: 'a', b: 'b', ohms: 33 });
    expect(good).toEqual({ ok: true, value: 'updateNetElement ok' });
    expect(calls).toEqual([{ method: 'updateNetElement', args: ['DQ1', 2, { kind: 'resistor', a: 'a', b: 'b', ohms: 33 }] }]);
  });

  it('registers handlers only through createIpcHandlers, and never hands untrusted text to shell.openExternal', () => {
    const dir = join(__dirname, '..', '..', 'main', 'electron');
    for (const file of readdirSync(dir).filter((f) => f.endsWith('.ts'))) {
      const source = readFileSync(join(dir, file), 'utf8');
      expect(source, file).not.toMatch(/openExternal/);
      expect(source, file).not.toMatch(/nodeIntegration:\s*true|sandbox:\s*false|contextIsolation:\s*false|webSecurity:\s*false/);
      const handles = source.match(/ipcMain\.(handle|on)\(/g) ?? [];
      if (file === 'main.ts') {
        expect(handles.length).toBe(1);
        expect(source).toMatch(/for \(const \[channel, handler\] of createIpcHandlers\(/);
      } else expect(handles, file).toEqual([]);
    }
  });
});

describe('the preload', () => {
  it('exposes one function per API method as window.slackline, and never ipcRenderer', async () => {
    await import('../../main/electron/preload.js');
    // The API, and the desktop's own capabilities apart from it (channels.ts HOST_CHANNELS).
    expect(electronContents.exposed.map(([key]) => key)).toEqual(['slackline', 'slacklineHost']);
    const bridge = electronContents.exposed[0][1] as Record<string, unknown>;
    expect(Object.keys(bridge).sort()).toEqual([...API_METHODS].sort());
    for (const method of API_METHODS) expect(typeof bridge[method]).toBe('function');
    expect(Object.isFrozen(bridge)).toBe(true);
    for (const leak of ['invoke', 'send', 'on', 'sendSync', 'ipcRenderer']) expect(bridge).not.toHaveProperty(leak);
    await (bridge.solveNet as (n: string) => Promise<unknown>)('DQ7');
    expect(electronContents.invoked).toEqual([[channelOf('solveNet'), 'DQ7']]);
    const host = electronContents.exposed[1][1] as Record<string, unknown>;
    expect(Object.keys(host)).toEqual(['showInFolder']);
    expect(Object.isFrozen(host)).toBe(true);
    await (host.showInFolder as (p: string) => Promise<unknown>)('/tmp/r.pdf');
    expect(electronContents.invoked.at(-1)).toEqual([HOST_CHANNELS.showInFolder, '/tmp/r.pdf']);
  });
});

describe('the Electron main process (main.ts, with a stand-in electron module)', () => {
  it('opens the project, registers one checked IPC handler per method, and serves the app with its CSP', async () => {
    const { createDemoProject } = await import('../../main/services/project/demo.js');
    const dir = mkdtempSync(join(tmpdir(), 'slackline-main-'));
    const project = createDemoProject(dir);
    const argv = process.argv;
    process.argv = [argv[0], 'main.js', project];
    try {
      await import('../../main/electron/main.js');
      await vi.waitFor(() => expect(electronContents.windows.length).toBe(1), { timeout: 20_000 });
    } finally {
      process.argv = argv;
    }
    expect(electronContents.dialogs).toEqual([]);
    expect(electronContents.schemes).toEqual([expect.objectContaining({ scheme: 'slackline-app' })]);
    const prefs = electronContents.windows[0].options.webPreferences as Record<string, unknown>;
    expect(prefs).toMatchObject({ contextIsolation: true, sandbox: true, nodeIntegration: false });
    expect(electronContents.windows[0].loaded).toEqual([APP_URL]);
    expect([...electronContents.handles.keys()].sort()).toEqual([...API_METHODS.map(channelOf), HOST_CHANNELS.showInFolder].sort());

    const fromApp = { senderFrame: { url: APP_URL, parent: null } };
    const summary = (await electronContents.handles.get(channelOf('getProject'))!(fromApp)) as { ok: boolean; value: { path: string } };
    expect(summary.ok).toBe(true);
    expect(summary.value.path).toBe(project);
    const foreign = (await electronContents.handles.get(channelOf('getProject'))!({ senderFrame: { url: 'https://example.com/' } })) as { ok: boolean };
    expect(foreign.ok).toBe(false);
    // Nothing was exported yet: revealing any file (the project itself here) is refused, the shell never called.
    const reveal = (await electronContents.handles.get(HOST_CHANNELS.showInFolder)!(fromApp, project)) as { ok: boolean; error?: { kind: string } };
    expect(reveal).toMatchObject({ ok: false, error: { kind: 'refused' } });
    expect(electronContents.revealed).toEqual([]);

    const page = await electronContents.protocol!({ url: `${APP_ORIGIN}/index.html` });
    expect(page.status).toBe(200);
    expect(page.headers.get('content-security-policy')).toBe(DESKTOP_CSP);
    expect((await electronContents.protocol!({ url: `${APP_ORIGIN}/%2e%2e/package.json` })).status).toBe(404);

    // The second line of defence for every web contents guards both navigation and redirects.
    const guards = new Map<string, (event: { preventDefault(): void }, url: string) => void>();
    electronContents.appEvents.get('web-contents-created')?.({}, {
      on: (event: string, handler: (e: { preventDefault(): void }, url: string) => void) => guards.set(event, handler),
      setWindowOpenHandler: () => {},
    });
    for (const kind of ['will-navigate', 'will-redirect']) {
      let prevented = false;
      guards.get(kind)?.({ preventDefault: () => { prevented = true; } }, 'https://example.com/');
      expect(prevented, kind).toBe(true);
    }

    // Closing the last window closes the project file (and quits).
    electronContents.appEvents.get('window-all-closed')?.();
    await vi.waitFor(() => expect(electronContents.quit).toBe(true));
    rmSync(dir, { recursive: true, force: true });
  });
});

describe('better-sqlite3 under Electron', () => {
  it('loads the Electron-ABI addon from its own folder only inside Electron, and the Node build otherwise', () => {
    const root = mkdtempSync(join(tmpdir(), 'slackline-native-'));
    try {
      expect(sqliteNativeBinding({ ...process.versions, electron: undefined } as unknown as NodeJS.ProcessVersions, root)).toBeUndefined();
      expect(sqliteNativeBinding({ ...process.versions, electron: '39.8.10' }, root)).toBeUndefined();
      mkdirSync(join(root, 'native', 'electron'), { recursive: true });
      writeFileSync(join(root, ELECTRON_SQLITE_BINDING), '');
      expect(sqliteNativeBinding({ ...process.versions, electron: '39.8.10' }, root)).toBe(join(root, ELECTRON_SQLITE_BINDING));
      expect(sqliteNativeBinding({ ...process.versions, electron: undefined } as unknown as NodeJS.ProcessVersions, root)).toBeUndefined();
    } finally {
      rmSync(root, { recursive: true, force: true });
    }
  });
});

describe('the packaged desktop build', () => {
  it('flips the Electron fuses in electron-builder.yml: no run-as-node, cookie encryption, ASAR integrity, code only from ASAR', async () => {
    // Electron security checklist, "Fuses" (electronjs.org/docs/latest/tutorial/fuses); the key names
    // are electron-builder's `electronFuses` options.
    const { parse } = await import('yaml');
    const config = parse(readFileSync(new URL('../../electron-builder.yml', import.meta.url), 'utf8')) as { electronFuses?: Record<string, boolean> };
    expect(config.electronFuses).toMatchObject({
      runAsNode: false,
      enableCookieEncryption: true,
      enableNodeOptionsEnvironmentVariable: false,
      enableNodeCliInspectArguments: false,
      enableEmbeddedAsarIntegrityValidation: true,
      onlyLoadAppFromAsar: true,
    });
  });
});

/**
 * The loopback HTTP shell (main/web/server.ts) against a recording fake of the API: the fake lets each
 * test see whether a request reached the service at all, which is the point of the checks below.
 * Sources: docs/design.md §7.1 (bind 127.0.0.1, per-run token,
 * 401 before anything else); the rest is common practice for local web servers, no single source.
 */
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { request } from 'node:http';
import { mkdtempSync, mkdirSync, rmSync, writeFileSync } from 'node:fs';
import { networkInterfaces, tmpdir } from 'node:os';
import { join } from 'node:path';
import { connect } from 'node:net';
import { InputError } from '../../core/errors.js';
import type { SlacklineApi } from '../../core/contract/api.js';
import { API_METHODS } from '../../core/contract/methods.js';
import { startWebShell, TOKEN_HEADER, type WebShell } from '../../main/web/server.js';

const calls: { method: string; args: unknown[] }[] = [];

/** Every method records its call; getProject answers, solveNet refuses with an InputError. */
function recordingApi(): SlacklineApi {
  const api: Record<string, unknown> = {};
  for (const method of API_METHODS) {
    api[method] = async (...args: unknown[]) => {
      calls.push({ method, args });
      if (method === 'solveNet') throw new InputError(`net ${String(args[0])}`, 'is not in the project');
      if (method === 'getJob') throw new Error('disk on fire');
      return { echo: method, args };
    };
  }
  return api as unknown as SlacklineApi;
}

interface Reply { status: number; headers: Record<string, string | string[] | undefined>; body: string }

function send(shell: WebShell, options: { method?: string; path: string; headers?: Record<string, string>; body?: string }): Promise<Reply> {
  return new Promise((resolve, reject) => {
    const req = request(
      { host: '127.0.0.1', port: shell.port, method: options.method ?? 'POST', path: options.path, headers: { host: `127.0.0.1:${shell.port}`, ...options.headers } },
      (res) => {
        const chunks: Buffer[] = [];
        res.on('data', (c: Buffer) => chunks.push(c));
        res.on('end', () => resolve({ status: res.statusCode ?? 0, headers: res.headers, body: Buffer.concat(chunks).toString('utf8') }));
      },
    );
    req.on('error', reject);
    req.end(options.body);
  });
}

let shell: WebShell;
let rendererDir: string;

beforeAll(async () => {
  rendererDir = mkdtempSync(join(tmpdir(), 'slackline-shell-'));
  mkdirSync(join(rendererDir, 'assets'));
  writeFileSync(join(rendererDir, 'index.html'), '<!doctype html><title>w</title>');
  writeFileSync(join(rendererDir, 'assets', 'app.js'), 'console.log(1)');
  writeFileSync(join(rendererDir, '..', 'outside-secret.txt'), 'secret');
  shell = await startWebShell({ api: recordingApi(), rendererDir });
});

afterAll(async () => {
  await shell.close();
  rmSync(rendererDir, { recursive: true, force: true });
  rmSync(join(rendererDir, '..', 'outside-secret.txt'), { force: true });
});

const json = (token?: string) => ({ 'content-type': 'application/json', ...(token === undefined ? {} : { [TOKEN_HEADER]: token }) });

describe('loopback HTTP shell', () => {
  it('listens on 127.0.0.1 only and prints an address with a long random token', () => {
    expect(shell.origin).toBe(`http://127.0.0.1:${shell.port}`);
    expect(shell.url).toBe(`${shell.origin}/?token=${shell.token}`);
    // 32 random bytes as hex: guessing is hopeless (common practice, no source).
    expect(shell.token).toMatch(/^[0-9a-f]{64}$/);
  });

  it('is not reachable on the machine\'s other addresses', async () => {
    const external = Object.values(networkInterfaces()).flat().find((a) => a && a.family === 'IPv4' && !a.internal);
    if (!external) return; // no non-loopback interface on this machine: nothing else to try
    const refused = await new Promise<boolean>((resolve) => {
      const socket = connect({ host: external.address, port: shell.port });
      socket.once('connect', () => { socket.destroy(); resolve(false); });
      socket.once('error', () => resolve(true));
    });
    expect(refused).toBe(true);
  });

  it('answers 401 to every API method without the token, and the service never sees the call', async () => {
    calls.length = 0;
    for (const method of [...API_METHODS, 'noSuchMethod']) {
      const reply = await send(shell, { path: `/api/${method}`, headers: json(), body: '[]' });
      expect(reply.status, method).toBe(401);
    }
    expect(calls).toEqual([]);
  });

  it('answers 401 before looking at anything else: wrong token, wrong verb, bad body, forged host', async () => {
    calls.length = 0;
    const wrong = shell.token.slice(0, -1) + (shell.token.endsWith('a') ? 'b' : 'a');
    const cases = [
      send(shell, { path: '/api/getProject', headers: json(wrong), body: '[]' }),
      send(shell, { path: '/api/getProject', headers: json(''), body: '[]' }),
      send(shell, { method: 'GET', path: '/api/getProject' }),
      send(shell, { path: '/api/getProject', headers: { 'content-type': 'text/plain' }, body: 'not json' }),
      send(shell, { path: '/api/getProject', headers: { ...json(), host: 'evil.example:80' }, body: '[]' }),
      send(shell, { path: `/api/getProject?token=${shell.token}`, headers: json(), body: '[]' }),
      send(shell, { path: '/api', headers: json(), body: '[]' }),
    ];
    for (const reply of await Promise.all(cases)) expect(reply.status).toBe(401);
    expect(calls).toEqual([]);
  });

  it('calls the service with validated arguments when the token is right', async () => {
    calls.length = 0;
    const reply = await send(shell, { path: '/api/getNetWaveforms', headers: json(shell.token), body: JSON.stringify(['DQ3']) });
    expect(reply.status).toBe(200);
    expect(JSON.parse(reply.body)).toEqual({ value: { echo: 'getNetWaveforms', args: ['DQ3'] } });
    expect(calls).toEqual([{ method: 'getNetWaveforms', args: ['DQ3'] }]);
  });

  it('refuses malformed arguments with 400 naming the argument, without calling the service', async () => {
    calls.length = 0;
    const cases: [string, unknown][] = [
      ['getNetWaveforms', [42]],
      ['updateNetElement', ['DQ3', 0, { kind: 'segment', a: 'n1', b: 'n2', layer: 'L3', width: 1e-4, length: -1 }]],
      ['updateNetElement', ['DQ3', 0, { kind: 'segment', a: 'n1', b: 'n2', layer: 'L3', width: 1e-4, length: 0.01, extra: 1 }]],
      ['startSolve', [{ bus: 'A', workers: 99 }]],
      ['exportReport', [{ formats: ['docx'] }]],
    ];
    for (const [method, args] of cases) {
      const reply = await send(shell, { path: `/api/${method}`, headers: json(shell.token), body: JSON.stringify(args) });
      expect(reply.status, method).toBe(400);
      const body = JSON.parse(reply.body) as { error: { kind: string; message: string } };
      expect(body.error.kind).toBe('payload');
      expect(body.error.message).toContain(method);
    }
    const notJson = await send(shell, { path: '/api/getProject', headers: json(shell.token), body: '{oops' });
    expect(notJson.status).toBe(400);
    expect(calls).toEqual([]);
  });

  it('passes an InputError back as 400 with where the problem is, and other failures as 500', async () => {
    const bad = await send(shell, { path: '/api/solveNet', headers: json(shell.token), body: '["XYZ"]' });
    expect(bad.status).toBe(400);
    expect(JSON.parse(bad.body).error).toEqual({ kind: 'input', message: 'net XYZ: is not in the project', where: 'net XYZ' });
    const broken = await send(shell, { path: '/api/getJob', headers: json(shell.token), body: '["j1"]' });
    expect(broken.status).toBe(500);
    expect(JSON.parse(broken.body).error.message).toBe('disk on fire');
  });

  it('refuses, with the token, an unknown method (404), a GET (405), non-JSON (415), a forged Host or a foreign Origin (403)', async () => {
    calls.length = 0;
    const t = json(shell.token);
    expect((await send(shell, { path: '/api/dropTables', headers: t, body: '[]' })).status).toBe(404);
    expect((await send(shell, { method: 'GET', path: '/api/getProject', headers: { [TOKEN_HEADER]: shell.token } })).status).toBe(405);
    expect((await send(shell, { path: '/api/getProject', headers: { [TOKEN_HEADER]: shell.token, 'content-type': 'text/plain' }, body: '[]' })).status).toBe(415);
    expect((await send(shell, { path: '/api/getProject', headers: { ...t, host: `attacker.example:${shell.port}` }, body: '[]' })).status).toBe(403);
    expect((await send(shell, { path: '/api/getProject', headers: { ...t, origin: 'https://attacker.example' }, body: '[]' })).status).toBe(403);
    expect(calls).toEqual([]);
  });

  it('answers a malformed URL escape in the method name with 400, not 500', async () => {
    // decodeURIComponent throws URIError on a cut escape (ECMA-262 §19.2.6.2); it used to reach the 500 handler.
    calls.length = 0;
    for (const path of ['/api/%E0%A4%A', '/api/get%Project', '/api/%']) {
      const reply = await send(shell, { path, headers: json(shell.token), body: '[]' });
      expect(reply.status, path).toBe(400);
      expect(JSON.parse(reply.body).error.message).toMatch(/malformed URL escape/);
    }
    expect(calls).toEqual([]);
  });

  it('serves the renderer with a strict CSP and no referrer, and nothing outside its folder', async () => {
    const page = await send(shell, { method: 'GET', path: '/' });
    expect(page.status).toBe(200);
    expect(page.headers['content-type']).toContain('text/html');
    const csp = String(page.headers['content-security-policy']);
    expect(csp).toContain("default-src 'none'");
    expect(csp).toContain("script-src 'self'");
    expect(csp).not.toContain('unsafe-inline');
    expect(csp).not.toContain('unsafe-eval');
    expect(page.headers['referrer-policy']).toBe('no-referrer');
    const script = await send(shell, { method: 'GET', path: '/assets/app.js' });
    expect(script.status).toBe(200);
    expect(script.headers['content-type']).toContain('text/javascript');
    for (const path of ['/../outside-secret.txt', '/%2e%2e/outside-secret.txt', '/assets/..%2f..%2foutside-secret.txt', '/nope.js']) {
      const reply = await send(shell, { method: 'GET', path });
      expect(reply.status, path).toBe(404);
      expect(reply.body).not.toContain('secret');
    }
    expect((await send(shell, { method: 'GET', path: '/', headers: { host: 'rebound.example' } })).status).toBe(403);
  });
});

describe('solve jobs through the shell (AppService with a solver the test drives)', () => {
  /** A solver that reports progress when told to and ends only when the test (or a cancel) says so. */
  function drivenSolver() {
    let report: ((fraction: number, message: string) => void) | null = null;
    let finish: (() => void) | null = null;
    const board = { project: 'p', solvedAt: '2026-01-01T00:00:00.000Z', fingerprint: 'f', toolVersion: 't', buses: [] };
    let solved = false;
    const solve = {
      solveBoard: ({ onProgress, signal }: { onProgress: (p: { fraction: number; message: string }) => void; signal: AbortSignal }) =>
        new Promise<typeof board>((resolve, reject) => {
          report = (fraction, message) => onProgress({ fraction, message });
          finish = () => { solved = true; resolve(board); };
          signal.addEventListener('abort', () => reject(new Error('aborted')));
        }),
      solveNet: async () => { throw new Error('not used'); },
      freshResults: () => (solved ? board : null),
      latestSolveAt: () => (solved ? board.solvedAt : null),
      netWaveforms: async () => { throw new Error('not used'); },
    };
    return { solve, progress: (f: number, m: string) => report?.(f, m), finish: () => finish?.() };
  }

  async function withShell<T>(driven: ReturnType<typeof drivenSolver>, body: (call: (m: string, args: unknown[]) => Promise<{ status: number; value: any }>) => Promise<T>): Promise<T> {
    const { AppService } = await import('../../main/services/api/app-service.js');
    const project = {
      path: '/x.slackline', load: () => { throw new Error('not used'); }, updateInfo() {}, updateStackup() {}, upsertPart() {},
      updateBus() {}, updateNetElement() {}, updateCorners() {}, previewImport() { throw new Error('not used'); }, applyImport() { throw new Error('not used'); },
    };
    const api = new AppService({ project, solve: driven.solve, layerProperties: () => [], exportReport: async () => ({ files: [] }) });
    const s = await startWebShell({ api, rendererDir });
    try {
      return await body(async (method, args) => {
        const reply = await send(s, { path: `/api/${method}`, headers: json(s.token), body: JSON.stringify(args) });
        return { status: reply.status, value: JSON.parse(reply.body).value };
      });
    } finally {
      await s.close();
    }
  }

  it('reports progress while running, then done with fresh results', async () => {
    const driven = drivenSolver();
    await withShell(driven, async (call) => {
      const started = await call('startSolve', [{}]);
      expect(started.value.state).toBe('running');
      driven.progress(0.25, 'DATA0: 4 of 16 nets');
      const running = await call('getJob', [started.value.id]);
      expect(running.value).toMatchObject({ state: 'running', progress: 0.25, message: 'DATA0: 4 of 16 nets' });
      expect((await call('getResults', [])).value).toBeNull();
      driven.finish();
      await new Promise((r) => setTimeout(r, 10));
      expect((await call('getJob', [started.value.id])).value).toMatchObject({ state: 'done', progress: 1 });
      expect((await call('getResults', [])).value.fingerprint).toBe('f');
    });
  });

  it('cancels a running solve: the job says cancelled and no results appear', async () => {
    const driven = drivenSolver();
    await withShell(driven, async (call) => {
      const started = await call('startSolve', [{ bus: 'DATA0' }]);
      const cancelled = await call('cancelJob', [started.value.id]);
      expect(cancelled.value.state).toBe('cancelled');
      expect((await call('getJob', [started.value.id])).value.state).toBe('cancelled');
      expect((await call('getResults', [])).value).toBeNull();
      const unknown = await call('getJob', ['no-such-job']);
      expect(unknown.status).toBe(400);
    });
  });
});

describe('one contract, two transports', () => {
  it('gives the same outcome over HTTP as over Electron IPC for the same calls', async () => {
    const { createIpcHandlers, channelOf } = await import('../../main/electron/ipc.js');
    const { APP_URL } = await import('../../main/electron/security.js');
    const ipc = createIpcHandlers(() => recordingApi());
    const cases: [string, unknown[]][] = [
      ['getProject', []],
      ['getNetWaveforms', ['DQ3']],
      ['solveNet', ['XYZ']], // InputError
      ['getJob', ['j1']], // internal failure
      ['updateNetElement', ['DQ3', 0, { kind: 'via', a: 'n1', farads: -1 }]], // payload error
    ];
    for (const [method, args] of cases) {
      const overIpc = await ipc.get(channelOf(method))!({ senderFrame: { url: APP_URL, parent: null } }, ...args);
      const reply = await send(shell, { path: `/api/${method}`, headers: json(shell.token), body: JSON.stringify(args) });
      const body = JSON.parse(reply.body) as { value?: unknown; error?: unknown };
      const overHttp = 'error' in body ? { ok: false, error: body.error } : { ok: true, value: body.value };
      expect(overHttp, method).toEqual(overIpc);
    }
  });
});

/**
 * The loopback HTTP shell: serves the built renderer and the SlacklineApi to a plain browser, for the
 * end-to-end tests and for reviewers without the desktop build.
 *
 * Any web page the user visits can send requests to localhost, so: the server binds 127.0.0.1 only;
 * every /api request must carry this run's random token (header `x-slackline-token`) and is refused
 * with 401 before anything else is looked at; the Host header must name the loopback address (a
 * DNS-rebinding page cannot forge it); responses carry a strict CSP and no-referrer so the token in
 * the start URL does not leak.
 */
import { createServer, type IncomingMessage, type ServerResponse } from 'node:http';
import { randomBytes, timingSafeEqual } from 'node:crypto';
import { readFile, stat } from 'node:fs/promises';
import { extname, join, normalize, resolve, sep } from 'node:path';
import type { AddressInfo } from 'node:net';
import type { SlacklineApi } from '../../core/contract/api.js';
import { dispatchApiCall } from '../services/api/dispatch.js';

export const TOKEN_HEADER = 'x-slackline-token';
/** Largest accepted API body: a 10,000-row length report is about 0.5 MB; this leaves ample room. */
const MAX_BODY_BYTES = 25 * 1024 * 1024;

/** Sent with every page; the renderer's index.html carries the same policy as a meta tag. */
export const WEB_CSP = [
  "default-src 'none'",
  "script-src 'self'",
  "style-src 'self'",
  "img-src 'self' data:",
  "font-src 'self'",
  "connect-src 'self'",
  "base-uri 'none'",
  "form-action 'none'",
  "frame-ancestors 'none'",
].join('; ');

const CONTENT_TYPES: Record<string, string> = {
  '.html': 'text/html; charset=utf-8',
  '.js': 'text/javascript; charset=utf-8',
  '.mjs': 'text/javascript; charset=utf-8',
  '.css': 'text/css; charset=utf-8',
  '.svg': 'image/svg+xml',
  '.png': 'image/png',
  '.ico': 'image/x-icon',
  '.json': 'application/json; charset=utf-8',
  '.woff2': 'font/woff2',
};

export interface WebShellOptions {
  /** The API to serve, or a function giving the open project's API on each call (it changes when a new project is opened). */
  api: SlacklineApi | (() => SlacklineApi);
  /** Folder of the built renderer (index.html and assets/). */
  rendererDir: string;
  /** 0 or absent: a free port chosen by the system. */
  port?: number;
  /** Fixed token (tests); absent: 32 random bytes, hex. */
  token?: string;
}

export interface WebShell {
  port: number;
  token: string;
  origin: string;
  /** The address to open: origin plus ?token=... */
  url: string;
  close(): Promise<void>;
}

export function newToken(): string {
  return randomBytes(32).toString('hex');
}

export async function startWebShell(options: WebShellOptions): Promise<WebShell> {
  const token = options.token ?? newToken();
  const rendererDir = resolve(options.rendererDir);
  let port = 0;

  const server = createServer((request, response) => {
    handle(request, response).catch((error: unknown) => {
      if (!response.headersSent) sendJson(response, 500, { error: { kind: 'internal', message: String(error), where: null } });
      else response.destroy();
    });
  });

  async function handle(request: IncomingMessage, response: ServerResponse): Promise<void> {
    const path = (request.url ?? '/').split('?')[0];
    if (path === '/api' || path.startsWith('/api/')) {
      if (!tokenMatches(request.headers[TOKEN_HEADER], token)) {
        sendJson(response, 401, { error: { kind: 'unauthorized', message: 'missing or wrong access token', where: null } });
        request.resume();
        return;
      }
      if (!hostIsLoopback(request.headers.host, port)) return refuse(request, response, 403, 'Host header is not this loopback server');
      const origin = request.headers.origin;
      if (origin !== undefined && origin !== `http://127.0.0.1:${port}` && origin !== `http://localhost:${port}`) {
        return refuse(request, response, 403, 'cross-origin API requests are refused');
      }
      if (request.method !== 'POST') return refuse(request, response, 405, 'API methods are called with POST');
      if (!(request.headers['content-type'] ?? '').startsWith('application/json')) {
        return refuse(request, response, 415, 'API bodies are JSON (content-type application/json)');
      }
      const body = await readBody(request);
      if (body === null) return refuse(request, response, 413, `request body larger than ${MAX_BODY_BYTES} bytes`);
      let args: unknown;
      try {
        args = body.length ? JSON.parse(body) : [];
      } catch {
        return sendJson(response, 400, { error: { kind: 'payload', message: 'request body is not valid JSON', where: null } });
      }
      let method: string;
      try {
        method = decodeURIComponent(path.slice('/api/'.length));
      } catch {
        // A malformed escape ("%E0%A4%A") is the caller's mistake: 400, never an internal error.
        return sendJson(response, 400, { error: { kind: 'payload', message: 'the method name in the path has a malformed URL escape', where: 'path' } });
      }
      const api = typeof options.api === 'function' ? options.api() : options.api;
      const outcome = await dispatchApiCall(api, method, args);
      if (outcome.ok) return sendJson(response, 200, { value: outcome.value });
      const status = outcome.error.kind === 'internal' ? 500 : outcome.error.kind === 'unknown-method' ? 404 : 400;
      return sendJson(response, status, { error: outcome.error });
    }

    if (!hostIsLoopback(request.headers.host, port)) return refuse(request, response, 403, 'Host header is not this loopback server');
    if (request.method !== 'GET' && request.method !== 'HEAD') return refuse(request, response, 405, 'only GET here');
    await serveStatic(rendererDir, path, request, response);
  }

  await new Promise<void>((resolvePromise, reject) => {
    server.once('error', reject);
    server.listen(options.port ?? 0, '127.0.0.1', () => resolvePromise());
  });
  port = (server.address() as AddressInfo).port;
  const origin = `http://127.0.0.1:${port}`;
  return {
    port,
    token,
    origin,
    url: `${origin}/?token=${token}`,
    close: () =>
      new Promise<void>((resolvePromise) => {
        server.close(() => resolvePromise());
        server.closeAllConnections();
      }),
  };
}

function tokenMatches(header: string | string[] | undefined, token: string): boolean {
  if (typeof header !== 'string') return false;
  const given = Buffer.from(header);
  const expected = Buffer.from(token);
  return given.length === expected.length && timingSafeEqual(given, expected);
}

function hostIsLoopback(host: string | undefined, port: number): boolean {
  return host === `127.0.0.1:${port}` || host === `localhost:${port}`;
}

function refuse(request: IncomingMessage, response: ServerResponse, status: number, message: string): void {
  request.resume();
  sendJson(response, status, { error: { kind: 'refused', message, where: null } });
}

function securityHeaders(response: ServerResponse): void {
  response.setHeader('Content-Security-Policy', WEB_CSP);
  response.setHeader('X-Content-Type-Options', 'nosniff');
  response.setHeader('Referrer-Policy', 'no-referrer');
  response.setHeader('X-Frame-Options', 'DENY');
  response.setHeader('Cross-Origin-Opener-Policy', 'same-origin');
  response.setHeader('Cross-Origin-Resource-Policy', 'same-origin');
  response.setHeader('Cache-Control', 'no-store');
}

function sendJson(response: ServerResponse, status: number, body: unknown): void {
  securityHeaders(response);
  response.statusCode = status;
  response.setHeader('Content-Type', 'application/json; charset=utf-8');
  response.end(JSON.stringify(body));
}

async function readBody(request: IncomingMessage): Promise<string | null> {
  const chunks: Buffer[] = [];
  let size = 0;
  for await (const chunk of request as AsyncIterable<Buffer>) {
    size += chunk.length;
    if (size > MAX_BODY_BYTES) return null;
    chunks.push(chunk);
  }
  return Buffer.concat(chunks).toString('utf8');
}

async function serveStatic(root: string, urlPath: string, request: IncomingMessage, response: ServerResponse): Promise<void> {
  let relative: string;
  try {
    relative = decodeURIComponent(urlPath);
  } catch {
    return sendText(response, 400, 'bad path');
  }
  if (relative.includes('\0')) return sendText(response, 400, 'bad path');
  if (relative === '/' || relative === '') relative = '/index.html';
  const file = normalize(join(root, relative));
  if (file !== root && !file.startsWith(root + sep)) return sendText(response, 404, 'not found');
  const info = await stat(file).catch(() => null);
  if (!info || !info.isFile()) {
    const hint = relative === '/index.html' ? ' (the renderer is not built: run npm run build:renderer)' : '';
    return sendText(response, 404, `not found${hint}`);
  }
  const body = await readFile(file);
  securityHeaders(response);
  response.statusCode = 200;
  response.setHeader('Content-Type', CONTENT_TYPES[extname(file).toLowerCase()] ?? 'application/octet-stream');
  response.setHeader('Content-Length', body.length);
  response.end(request.method === 'HEAD' ? undefined : body);
}

function sendText(response: ServerResponse, status: number, text: string): void {
  securityHeaders(response);
  response.statusCode = status;
  response.setHeader('Content-Type', 'text/plain; charset=utf-8');
  response.end(text);
}

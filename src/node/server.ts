// Local browser mode: serves the built renderer and the API on 127.0.0.1 only. Every request
// must carry the per-start random token (query on the first page load, then an HttpOnly
// SameSite=Strict cookie for assets and a header for API calls); Host and Origin must be this
// server's own, so another origin or a DNS-rebinding name gets nothing.

import { createServer, type IncomingMessage, type Server, type ServerResponse } from 'node:http';
import { createReadStream, createWriteStream, existsSync, mkdtempSync, rmSync, statSync } from 'node:fs';
import { randomBytes, timingSafeEqual } from 'node:crypto';
import { tmpdir } from 'node:os';
import { basename, extname, join, normalize, resolve, sep } from 'node:path';
import { pipeline } from 'node:stream/promises';
import { encodePayload } from '../shared/codec';
import { API_METHODS, type OffstateApi } from '../shared/api';
import { validateArgs } from '../shared/validate';
import { CONTENT_SECURITY_POLICY } from '../shared/csp';
import type { OffstateService } from './service';

export { CONTENT_SECURITY_POLICY };

const MIME: Record<string, string> = {
  '.html': 'text/html; charset=utf-8', '.js': 'text/javascript; charset=utf-8', '.css': 'text/css; charset=utf-8',
  '.svg': 'image/svg+xml', '.png': 'image/png', '.json': 'application/json', '.woff2': 'font/woff2', '.ico': 'image/x-icon',
};

export interface ServerOptions {
  service: OffstateService;
  uiDir: string;
  port?: number;
  token?: string;
  /** Largest accepted JSON call body; uploads have their own limit. */
  maxCallBytes?: number;
  maxUploadBytes?: number;
}

export interface RunningServer {
  server: Server;
  url: string;
  token: string;
  port: number;
  close(): Promise<void>;
}

function sameToken(given: string | undefined, token: string): boolean {
  if (!given) return false;
  const a = Buffer.from(given);
  const b = Buffer.from(token);
  return a.length === b.length && timingSafeEqual(a, b);
}

function cookieToken(req: IncomingMessage): string | undefined {
  const header = req.headers.cookie ?? '';
  for (const part of header.split(';')) {
    const [k, ...v] = part.trim().split('=');
    if (k === 'offstate_token') return v.join('=');
  }
  return undefined;
}

function send(res: ServerResponse, status: number, body: Uint8Array | string, type: string): void {
  res.writeHead(status, {
    'Content-Type': type,
    'Content-Length': Buffer.byteLength(body),
    'Cache-Control': 'no-store',
    'X-Content-Type-Options': 'nosniff',
    'Referrer-Policy': 'no-referrer',
    'Cross-Origin-Opener-Policy': 'same-origin',
    'Cross-Origin-Resource-Policy': 'same-origin',
    'X-Frame-Options': 'DENY',
    'Content-Security-Policy': CONTENT_SECURITY_POLICY,
  });
  res.end(body);
}

function sendEnvelope(res: ServerResponse, status: number, envelope: unknown): void {
  send(res, status, encodePayload(envelope), 'application/octet-stream');
}

async function readBody(req: IncomingMessage, limit: number): Promise<Buffer> {
  const chunks: Buffer[] = [];
  let size = 0;
  for await (const chunk of req as AsyncIterable<Buffer>) {
    size += chunk.byteLength;
    if (size > limit) throw Object.assign(new Error(`Request body is larger than ${limit} bytes.`), { status: 413 });
    chunks.push(chunk);
  }
  return Buffer.concat(chunks);
}

export async function startServer(options: ServerOptions): Promise<RunningServer> {
  const token = options.token ?? randomBytes(24).toString('base64url');
  const uiDir = resolve(options.uiDir);
  const maxCall = options.maxCallBytes ?? 1 << 20;
  const maxUpload = options.maxUploadBytes ?? 4 * 1024 ** 3;
  const service = options.service;
  let port = 0;
  const allowedHosts = () => new Set([`127.0.0.1:${port}`, `localhost:${port}`]);

  const handle = async (req: IncomingMessage, res: ServerResponse) => {
    const host = req.headers.host ?? '';
    if (!allowedHosts().has(host)) { send(res, 421, 'Unknown host.', 'text/plain'); return; }
    const origin = req.headers.origin;
    if (origin !== undefined && origin !== `http://${host}`) { send(res, 403, 'Cross-origin requests are refused.', 'text/plain'); return; }
    const url = new URL(req.url ?? '/', `http://${host}`);
    const path = url.pathname;

    if (path.startsWith('/api/')) {
      const given = (req.headers['x-offstate-token'] as string | undefined) ?? (path === '/api/events' ? url.searchParams.get('token') ?? cookieToken(req) : undefined);
      if (!sameToken(given, token)) { sendEnvelope(res, 401, { ok: false, error: { message: 'Missing or wrong token.' } }); return; }
      if (path === '/api/events' && req.method === 'GET') {
        res.writeHead(200, { 'Content-Type': 'text/event-stream', 'Cache-Control': 'no-store', Connection: 'keep-alive', 'X-Content-Type-Options': 'nosniff' });
        res.write(': connected\n\n');
        const off = service.onProgress((event) => res.write(`data: ${JSON.stringify(event)}\n\n`));
        const ping = setInterval(() => res.write(': ping\n\n'), 15000);
        req.on('close', () => { off(); clearInterval(ping); });
        return;
      }
      if (req.method !== 'POST') { sendEnvelope(res, 405, { ok: false, error: { message: 'Use POST.' } }); return; }
      if (path === '/api/upload') {
        const name = basename(url.searchParams.get('name') ?? 'upload.csv').replace(/[^\w.\- ]+/g, '_').slice(0, 200) || 'upload.csv';
        const declared = Number(req.headers['content-length'] ?? 0);
        if (declared > maxUpload) { sendEnvelope(res, 413, { ok: false, error: { message: `Upload is larger than ${maxUpload} bytes.` } }); req.resume(); return; }
        const dir = mkdtempSync(join(tmpdir(), 'offstate-upload-'));
        const file = join(dir, name);
        try {
          let size = 0;
          req.on('data', (chunk: Buffer) => { size += chunk.byteLength; if (size > maxUpload) req.destroy(new Error('too large')); });
          await pipeline(req, createWriteStream(file));
          const result = await service.importFile(file, name);
          sendEnvelope(res, 200, { ok: true, result });
        } finally {
          rmSync(dir, { recursive: true, force: true });
        }
        return;
      }
      const method = path.slice('/api/call/'.length);
      if (!path.startsWith('/api/call/') || !(API_METHODS as readonly string[]).includes(method)) {
        sendEnvelope(res, 404, { ok: false, error: { message: `Unknown API method "${method.slice(0, 64)}".` } });
        return;
      }
      if (!(req.headers['content-type'] ?? '').startsWith('application/json')) {
        sendEnvelope(res, 415, { ok: false, error: { message: 'API calls must be application/json.' } });
        return;
      }
      const body = JSON.parse((await readBody(req, maxCall)).toString('utf8')) as { args?: unknown };
      const args = body.args ?? [];
      if (method === 'importBytes') {
        sendEnvelope(res, 400, { ok: false, error: { message: 'Send file bytes to /api/upload.' } });
        return;
      }
      validateArgs(method, args);
      if (method === 'analyzeLot') {
        // Already encoded by the analysis thread: sent as it is.
        send(res, 200, await service.analyzeLotEnvelope(args[0] as string), 'application/octet-stream');
        return;
      }
      const fn = (service as unknown as Record<string, (...a: unknown[]) => Promise<unknown>>)[method as keyof OffstateApi];
      const result = await fn.apply(service, args);
      sendEnvelope(res, 200, { ok: true, result });
      return;
    }

    // Static renderer files: first load needs ?token=, then the cookie does.
    const queryToken = url.searchParams.get('token') ?? undefined;
    const fromQuery = sameToken(queryToken, token);
    if (!fromQuery && !sameToken(cookieToken(req), token)) { send(res, 401, 'Open the address Offstate printed at start (it carries the token).', 'text/plain'); return; }
    if (req.method !== 'GET' && req.method !== 'HEAD') { send(res, 405, 'Method not allowed.', 'text/plain'); return; }
    const relative = path === '/' ? 'index.html' : decodeURIComponent(path.slice(1));
    const file = normalize(join(uiDir, relative));
    if (!file.startsWith(uiDir + sep) || !existsSync(file) || !statSync(file).isFile()) { send(res, 404, 'Not found.', 'text/plain'); return; }
    const headers: Record<string, string | number> = {
      'Content-Type': MIME[extname(file)] ?? 'application/octet-stream',
      'Content-Length': statSync(file).size,
      'Cache-Control': 'no-store',
      'X-Content-Type-Options': 'nosniff',
      'Referrer-Policy': 'no-referrer',
      'X-Frame-Options': 'DENY',
      'Content-Security-Policy': CONTENT_SECURITY_POLICY,
    };
    if (fromQuery) headers['Set-Cookie'] = `offstate_token=${token}; HttpOnly; SameSite=Strict; Path=/`;
    res.writeHead(200, headers);
    if (req.method === 'HEAD') { res.end(); return; }
    createReadStream(file).pipe(res);
  };

  const server = createServer((req, res) => {
    handle(req, res).catch((error: Error & { status?: number }) => {
      if (res.headersSent) { res.destroy(); return; }
      const status = error.status ?? (error.name === 'ArgumentError' || error instanceof SyntaxError ? 400 : error.name === 'NotFoundError' ? 404 : 500);
      const known = ['ImportError', 'StoreError', 'NotFoundError', 'ArgumentError', 'DuplicateWaferError', 'CancelledError', 'SyntaxError'];
      const message = status < 500 || known.includes(error.name) ? error.message : `Internal error: ${error.message}`;
      sendEnvelope(res, status === 500 && known.includes(error.name) ? 422 : status, { ok: false, error: { name: error.name, message } });
    });
  });
  server.requestTimeout = 0;
  await new Promise<void>((resolveListen, reject) => {
    server.once('error', reject);
    server.listen(options.port ?? 0, '127.0.0.1', () => resolveListen());
  });
  const address = server.address();
  port = typeof address === 'object' && address ? address.port : 0;
  const url = `http://127.0.0.1:${port}/?token=${token}`;
  return {
    server, url, token, port,
    close: () => new Promise<void>((r) => { server.closeAllConnections(); server.close(() => r()); }),
  };
}

import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { mkdirSync, rmSync, writeFileSync } from 'node:fs';
import { request } from 'node:http';
import { join } from 'node:path';
import { OffstateService } from '../../src/node/service';
import { startServer, type RunningServer } from '../../src/node/server';
import { decodePayload } from '../../src/shared/codec';
import { scratchDir } from '../support/paths';

let dir: string;
let running: RunningServer;
let service: OffstateService;

beforeAll(async () => {
  dir = scratchDir();
  mkdirSync(join(dir, 'ui'));
  writeFileSync(join(dir, 'ui', 'index.html'), '<!doctype html><title>t</title>');
  writeFileSync(join(dir, 'secret.txt'), 'outside the ui folder');
  service = new OffstateService({ dbPath: join(dir, 'db.sqlite'), mode: 'browser' });
  running = await startServer({ service, uiDir: join(dir, 'ui'), maxCallBytes: 1024, maxUploadBytes: 64 * 1024 });
});
afterAll(async () => {
  await running.close();
  service.close();
  rmSync(dir, { recursive: true, force: true });
});

/** A second local client speaking raw HTTP, so Host and Origin can be anything. */
function raw(path: string, options: { method?: string; headers?: Record<string, string>; body?: string | Buffer } = {}) {
  return new Promise<{ status: number; headers: Record<string, unknown>; body: Buffer }>((resolve, reject) => {
    const req = request({ host: '127.0.0.1', port: running.port, path, method: options.method ?? 'GET', headers: { host: `127.0.0.1:${running.port}`, ...options.headers } }, (res) => {
      const chunks: Buffer[] = [];
      res.on('data', (c: Buffer) => chunks.push(c));
      res.on('end', () => resolve({ status: res.statusCode ?? 0, headers: res.headers, body: Buffer.concat(chunks) }));
    });
    req.on('error', reject);
    req.end(options.body);
  });
}

const call = (method: string, args: unknown[], headers: Record<string, string> = {}) =>
  raw(`/api/call/${method}`, { method: 'POST', headers: { 'content-type': 'application/json', 'x-offstate-token': running.token, ...headers }, body: JSON.stringify({ args }) });

describe('local browser mode server', () => {
  it('listens on 127.0.0.1 only and prints a URL carrying the token', () => {
    expect(running.url).toMatch(new RegExp(`^http://127\\.0\\.0\\.1:${running.port}/\\?token=[\\w-]{32}$`));
    const address = running.server.address();
    expect(typeof address === 'object' && address?.address).toBe('127.0.0.1');
  });
  it('serves the page with the token and sets a strict cookie; refuses it without', async () => {
    const bad = await raw('/');
    expect(bad.status).toBe(401);
    const good = await raw(`/?token=${running.token}`);
    expect(good.status).toBe(200);
    expect(String(good.headers['set-cookie'])).toMatch(/HttpOnly; SameSite=Strict/);
    expect(String(good.headers['content-security-policy'])).toMatch(/script-src 'self'/);
    const withCookie = await raw('/index.html', { headers: { cookie: `offstate_token=${running.token}` } });
    expect(withCookie.status).toBe(200);
  });
  it('answers API calls with the token header and refuses them without it or with a wrong one', async () => {
    const ok = await call('getInfo', []);
    expect(ok.status).toBe(200);
    expect(decodePayload<{ ok: boolean; result: { mode: string } }>(ok.body).result.mode).toBe('browser');
    expect((await call('getInfo', [], { 'x-offstate-token': 'nope' })).status).toBe(401);
    const cookieOnly = await raw('/api/call/getInfo', { method: 'POST', headers: { 'content-type': 'application/json', cookie: `offstate_token=${running.token}` }, body: '{"args":[]}' });
    expect(cookieOnly.status).toBe(401);
  });
  it('gives nothing to another origin or a DNS-rebinding host name', async () => {
    expect((await call('getInfo', [], { origin: 'http://evil.example' })).status).toBe(403);
    expect((await call('getInfo', [], { host: `attacker.example:${running.port}` })).status).toBe(421);
    expect((await raw(`/?token=${running.token}`, { headers: { host: 'rebind.example' } })).status).toBe(421);
    const ok = await call('getInfo', []);
    expect(ok.headers['access-control-allow-origin']).toBeUndefined();
  });
  it('refuses bad arguments, unknown methods, oversized bodies and paths outside the ui folder', async () => {
    const bad = await call('listWafers', [42]);
    expect(bad.status).toBe(400);
    expect(decodePayload<{ error: { message: string } }>(bad.body).error.message).toMatch(/must be text/);
    expect((await call('close', [])).status).toBe(404);
    expect((await call('listWafers', ['x'.repeat(5000)])).status).toBe(413);
    const traversal = await raw('/..%2fsecret.txt', { headers: { cookie: `offstate_token=${running.token}` } });
    expect(traversal.status).toBe(404);
    expect(traversal.body.toString()).not.toMatch(/outside/);
  });
  it('refuses uploads over the size limit and progress streams without the token', async () => {
    const big = Buffer.alloc(100 * 1024, 0x41);
    const refused = await raw('/api/upload?name=big.csv', { method: 'POST', headers: { 'x-offstate-token': running.token }, body: big });
    expect(refused.status).toBe(413);
    expect((await raw('/api/events')).status).toBe(401);
    expect((await raw('/api/upload?name=x.csv', { method: 'POST', body: 'Lot,Wafer\n' })).status).toBe(401);
    const lots = decodePayload<{ result: unknown[] }>((await call('listLots', [])).body).result;
    expect(lots.map((l) => (l as { lot: string }).lot)).not.toContain('big');
  });
  it('imports an uploaded file and reports a missing lot as not found', async () => {
    const csv = 'Lot,Wafer,X,Y,Ioff_n [pA]\nUP1,1,0,0,5\nUP1,1,1,0,6\n';
    const up = await raw('/api/upload?name=up.csv', { method: 'POST', headers: { 'x-offstate-token': running.token }, body: csv });
    expect(up.status).toBe(200);
    expect(decodePayload<{ result: { status: string; rows: number } }>(up.body).result).toMatchObject({ status: 'imported', rows: 2 });
    const missing = await call('listWafers', ['NOPE']);
    expect(missing.status).toBe(404);
  });
});

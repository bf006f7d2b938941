// Shared set-up of the end-to-end tests: the built browser-mode server on a scratch database, Debian's
// Chromium through playwright-core, API calls over HTTP with the token (decoded with the shared
// codec), and a few readers for what the page shows and saves.
import { spawn, type ChildProcess } from 'node:child_process';
import { existsSync, mkdirSync, rmSync } from 'node:fs';
import { dirname, join } from 'node:path';
import { chromium, type BrowserContext, type Page } from 'playwright-core';
import { decodePayload } from '../../src/shared/codec';
import { DEMO_CSV, ROOT, scratchDir } from '../support/paths';

export const CHROMIUM = '/usr/bin/chromium';
export const SERVER = join(ROOT, 'dist', 'node', 'server.mjs');
export const UI_INDEX = join(ROOT, 'dist', 'ui', 'index.html');
export const ARTIFACTS = join(ROOT, 'test-artifacts', 'e2e');
export const TIMEOUT = 60_000;
export { DEMO_CSV, ROOT };

export const missingForE2e = [CHROMIUM, SERVER, UI_INDEX, DEMO_CSV].filter((path) => !existsSync(path));

export interface Session {
  url: string;
  origin: string;
  token: string;
  workDir: string;
  context: BrowserContext;
  page: Page;
  problems: string[];
  api<T>(method: string, ...args: unknown[]): Promise<T>;
  upload(name: string, bytes: Uint8Array): Promise<unknown>;
  close(): Promise<void>;
}

function startServer(dbPath: string): Promise<{ child: ChildProcess; url: string }> {
  return new Promise((resolve, reject) => {
    const child = spawn(process.execPath, [SERVER, '--db', dbPath], { cwd: ROOT, stdio: ['ignore', 'pipe', 'pipe'], env: { ...process.env, OFFSTATE_RECENT_FILE: join(dirname(dbPath), 'recent-databases.json') } });
    let output = '';
    const timer = setTimeout(() => reject(new Error(`server printed no URL within 60 s:\n${output}`)), TIMEOUT);
    child.stdout?.on('data', (chunk: Buffer) => {
      output += chunk.toString();
      const match = /Offstate browser mode: (http:\/\/127\.0\.0\.1:\d+\/\?token=\S+)/.exec(output);
      if (match) { clearTimeout(timer); resolve({ child, url: match[1] }); }
    });
    child.stderr?.on('data', (chunk: Buffer) => { output += chunk.toString(); });
    child.on('exit', (code) => { clearTimeout(timer); reject(new Error(`server exited with ${code}:\n${output}`)); });
  });
}

export async function openSession(prefix: string): Promise<Session> {
  mkdirSync(ARTIFACTS, { recursive: true });
  const workDir = scratchDir(prefix);
  const { child, url } = await startServer(join(workDir, 'e2e.sqlite'));
  const parsed = new URL(url);
  const origin = parsed.origin;
  const token = parsed.searchParams.get('token') ?? '';
  const context = await chromium.launchPersistentContext(join(workDir, 'chromium-profile'), {
    executablePath: CHROMIUM,
    headless: true,
    args: ['--headless', '--no-sandbox', '--disable-gpu', '--disable-background-networking', '--disable-component-update', '--disable-sync', '--no-first-run'],
    viewport: { width: 1600, height: 1000 },
    acceptDownloads: true,
  });
  const page = context.pages()[0] ?? await context.newPage();
  const problems: string[] = [];
  page.on('pageerror', (error) => problems.push(`page error: ${error.message}`));
  page.on('console', (message) => {
    if (message.type() === 'error' || /Content Security Policy|Refused to/i.test(message.text())) problems.push(`console: ${message.text()}`);
  });
  const readEnvelope = async <T>(response: Response): Promise<T> => {
    const envelope = decodePayload<{ ok: boolean; result?: T; error?: { message: string } }>(new Uint8Array(await response.arrayBuffer()));
    if (!envelope.ok) throw new Error(envelope.error?.message ?? 'API error');
    return envelope.result as T;
  };
  return {
    url, origin, token, workDir, context, page, problems,
    async api<T>(method: string, ...args: unknown[]): Promise<T> {
      const response = await fetch(`${origin}/api/call/${method}`, {
        method: 'POST', headers: { 'X-Offstate-Token': token, 'Content-Type': 'application/json' }, body: JSON.stringify({ args }),
      });
      return readEnvelope<T>(response);
    },
    async upload(name: string, bytes: Uint8Array) {
      const response = await fetch(`${origin}/api/upload?name=${encodeURIComponent(name)}`, {
        method: 'POST', headers: { 'X-Offstate-Token': token }, body: bytes as Uint8Array<ArrayBuffer>,
      });
      return readEnvelope(response);
    },
    async close() {
      await context.close();
      if (child.exitCode === null) {
        const exited = new Promise((resolve) => child.once('exit', resolve));
        child.kill('SIGTERM');
        await Promise.race([exited, new Promise((resolve) => setTimeout(resolve, 5000))]);
      }
      rmSync(workDir, { recursive: true, force: true });
    },
  };
}

/** RFC 4180 records (quoted fields may hold commas, doubled quotes and line breaks). */
export function parseCsv(text: string): string[][] {
  const records: string[][] = [];
  let field = '';
  let record: string[] = [];
  let quoted = false;
  for (let i = 0; i < text.length; i++) {
    const c = text[i];
    if (quoted) {
      if (c === '"' && text[i + 1] === '"') { field += '"'; i++; } else if (c === '"') quoted = false; else field += c;
    } else if (c === '"') quoted = true;
    else if (c === ',') { record.push(field); field = ''; } else if (c === '\n' || c === '\r') {
      if (c === '\r' && text[i + 1] === '\n') i++;
      record.push(field); records.push(record); record = []; field = '';
    } else field += c;
  }
  if (field !== '' || record.length) { record.push(field); records.push(record); }
  return records;
}

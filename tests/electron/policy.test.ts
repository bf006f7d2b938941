// The desktop shell's security settings, checked against Electron's security checklist
// (Electron docs, tutorial/security.md): isolation, sandbox, no Node in the renderer, strict CSP.
import { describe, expect, it } from 'vitest';
import { createRequire } from 'node:module';
import { existsSync, readFileSync } from 'node:fs';
import { join } from 'node:path';
import { secureWebPreferences, isAllowedExternal, CONTENT_SECURITY_POLICY, APP_ORIGIN, ELECTRON_FUSES } from '../../electron/policy';
import { FuseV1Options } from '@electron/fuses';
import { ROOT } from '../support/paths';

describe('desktop window security', () => {
  it('turns on context isolation and the sandbox, and keeps Node out of every renderer context', () => {
    const prefs = secureWebPreferences('/x/preload.cjs');
    expect(prefs).toMatchObject({
      contextIsolation: true, sandbox: true, nodeIntegration: false, nodeIntegrationInWorker: false,
      nodeIntegrationInSubFrames: false, webSecurity: true, allowRunningInsecureContent: false, webviewTag: false,
    });
  });
  it('uses a CSP with no inline script, no eval and no remote sources', () => {
    expect(CONTENT_SECURITY_POLICY).toMatch(/default-src 'self'/);
    expect(CONTENT_SECURITY_POLICY).toMatch(/script-src 'self'(;|$)/);
    expect(CONTENT_SECURITY_POLICY).not.toMatch(/unsafe-inline|unsafe-eval|\*|http:|https:/);
    expect(CONTENT_SECURITY_POLICY).toMatch(/object-src 'none'/);
  });
  it('opens only allow-listed https links outside the app', () => {
    expect(isAllowedExternal('https://www.jedec.org/standards-documents')).toBe(true);
    expect(isAllowedExternal('http://www.jedec.org/')).toBe(false);
    expect(isAllowedExternal('file:///etc/passwd')).toBe(false);
    expect(isAllowedExternal('https://www.jedec.org.evil.example/')).toBe(false);
  });
  it('serves the renderer from its own custom protocol, never file://', () => {
    expect(APP_ORIGIN).toBe('offstate://app');
    const main = readFileSync(join(ROOT, 'electron', 'main.ts'), 'utf8');
    expect(main).toMatch(/loadURL\(`\$\{APP_SCHEME\}:\/\/app\/index\.html`\)/);
    expect(main).not.toMatch(/loadFile\(/);
    // The window is built with exactly these preferences, and the session rules are applied.
    expect(main).toMatch(/webPreferences: secureWebPreferences\(/);
    expect(main).toMatch(/hardenSession\(\)/);
    expect(main).toMatch(/hardenContents\(mainWindow\.webContents\)/);
    expect(main).toMatch(/requestSingleInstanceLock\(\)/);
  });
  // Electron docs, tutorial/fuses.md: the fuses that turn off Node-style entry points.
  it('decides every fuse Electron defines, with the Node entry points off', () => {
    const known = Object.keys(FuseV1Options).filter((k) => Number.isNaN(Number(k)));
    expect(Object.keys(ELECTRON_FUSES).sort()).toEqual(known.sort());
    expect(ELECTRON_FUSES).toMatchObject({ RunAsNode: false, EnableNodeOptionsEnvironmentVariable: false, EnableNodeCliInspectArguments: false, GrantFileProtocolExtraPrivileges: false, EnableCookieEncryption: true, EnableEmbeddedAsarIntegrityValidation: true, OnlyLoadAppFromAsar: true });
  });
  it('exposes no raw ipcRenderer from the preload', () => {
    const preload = readFileSync(join(ROOT, 'electron', 'preload.ts'), 'utf8');
    expect(preload).not.toMatch(/exposeInMainWorld\([^)]*ipcRenderer\s*\)/);
    expect(preload.match(/exposeInMainWorld/g)?.length).toBe(1);
  });
});

const require = createRequire(import.meta.url);
function electronBinary(): string | undefined {
  try { const p = require('electron') as unknown; return typeof p === 'string' && existsSync(p) ? p : undefined; } catch { return undefined; }
}
const binary = electronBinary();
if (!binary) console.log('Electron launch test skipped: no Electron binary on this machine (ELECTRON_SKIP_BINARY_DOWNLOAD).');

describe.skipIf(!binary)('desktop launch', () => {
  it('starts the shell and quits cleanly', async () => {
    const { spawnSync } = await import('node:child_process');
    const run = spawnSync(binary!, ['--version'], { encoding: 'utf8' });
    expect(run.status).toBe(0);
    expect(run.stdout).toMatch(/^v\d+\./);
  });
});

// The desktop shell's security policy as plain values (no Electron import), so tests can read
// them and fail on any regression: Electron's security checklist, the parts that apply.

import type { WebPreferences } from 'electron';
import { CONTENT_SECURITY_POLICY } from '../src/shared/csp';

export const APP_SCHEME = 'offstate';
export const APP_ORIGIN = `${APP_SCHEME}://app`;

export { CONTENT_SECURITY_POLICY };

export function secureWebPreferences(preload: string): WebPreferences {
  return {
    preload,
    contextIsolation: true,
    sandbox: true,
    nodeIntegration: false,
    nodeIntegrationInWorker: false,
    nodeIntegrationInSubFrames: false,
    webSecurity: true,
    allowRunningInsecureContent: false,
    experimentalFeatures: false,
    webviewTag: false,
    navigateOnDragDrop: false,
    spellcheck: false,
  };
}

const EXTERNAL_ALLOWED = [/^https:\/\/www\.jedec\.org\//, /^https:\/\/www\.aecouncil\.com\//];

export function isAllowedExternal(url: string): boolean {
  return EXTERNAL_ALLOWED.some((pattern) => pattern.test(url));
}


/**
 * Electron fuses for a packaged build (Electron docs, tutorial/fuses.md), every one decided:
 * no running as plain Node, no NODE_OPTIONS or inspector flags, cookies encrypted, the app only
 * from its integrity-checked asar, no extra file:// privileges. `node scripts/apply-fuses.mjs
 * BINARY` writes them into a packaged binary; the development launch runs an unpackaged folder,
 * so the asar fuses apply to packages only.
 */
export const ELECTRON_FUSES = {
  RunAsNode: false,
  EnableCookieEncryption: true,
  EnableNodeOptionsEnvironmentVariable: false,
  EnableNodeCliInspectArguments: false,
  EnableEmbeddedAsarIntegrityValidation: true,
  OnlyLoadAppFromAsar: true,
  LoadBrowserProcessSpecificV8Snapshot: false,
  GrantFileProtocolExtraPrivileges: false,
  WasmTrapHandlers: true,
} as const;

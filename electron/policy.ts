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


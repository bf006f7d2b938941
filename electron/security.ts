// The desktop shell's security settings in one place (Electron's security checklist): isolated,
// sandboxed renderer with no Node, a strict Content-Security-Policy, no navigation, no new
// windows, no permissions, and external links only to an allow-list.

import { session, shell, type WebContents, type WebPreferences } from 'electron';

export const APP_SCHEME = 'offstate';
export const APP_ORIGIN = `${APP_SCHEME}://app`;

export const CONTENT_SECURITY_POLICY = [
  "default-src 'self'", "script-src 'self'", "style-src 'self'", "img-src 'self' data: blob:",
  "connect-src 'self'", "font-src 'self'", "object-src 'none'", "base-uri 'none'", "form-action 'none'", "frame-ancestors 'none'",
].join('; ');

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

/** Applies session-wide rules: CSP on every response, every permission request denied. */
export function hardenSession(): void {
  const ses = session.defaultSession;
  ses.setPermissionRequestHandler((_wc, _permission, callback) => callback(false));
  ses.setPermissionCheckHandler(() => false);
  ses.webRequest.onHeadersReceived((details, callback) => {
    callback({ responseHeaders: { ...details.responseHeaders, 'Content-Security-Policy': [CONTENT_SECURITY_POLICY] } });
  });
}

/** Blocks navigation away from the app and every new window; allowed links open outside. */
export function hardenContents(contents: WebContents): void {
  contents.on('will-navigate', (event, url) => {
    if (!url.startsWith(APP_ORIGIN + '/')) event.preventDefault();
  });
  contents.on('will-redirect', (event, url) => {
    if (!url.startsWith(APP_ORIGIN + '/')) event.preventDefault();
  });
  contents.on('will-attach-webview', (event) => event.preventDefault());
  contents.setWindowOpenHandler(({ url }) => {
    if (isAllowedExternal(url)) void shell.openExternal(url);
    return { action: 'deny' };
  });
}

// The desktop shell's security settings in one place (Electron's security checklist): isolated,
// sandboxed renderer with no Node, a strict Content-Security-Policy, no navigation, no new
// windows, no permissions, and external links only to an allow-list.

import { session, shell, type WebContents } from 'electron';

export { APP_SCHEME, APP_ORIGIN, CONTENT_SECURITY_POLICY, secureWebPreferences, isAllowedExternal } from './policy';
import { APP_ORIGIN, CONTENT_SECURITY_POLICY, isAllowedExternal } from './policy';

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

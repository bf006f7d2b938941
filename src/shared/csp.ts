// The one Content-Security-Policy of the renderer, sent by the desktop shell and the browser mode
// alike: scripts, styles and connections only from the app itself, no inline script, no eval.
export const CONTENT_SECURITY_POLICY = [
  "default-src 'self'", "script-src 'self'", "style-src 'self'", "img-src 'self' data: blob:",
  "connect-src 'self'", "font-src 'self'", "object-src 'none'", "base-uri 'none'", "form-action 'none'", "frame-ancestors 'none'",
].join('; ');

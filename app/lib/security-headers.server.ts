// Security headers. Every response gets the base set from the server entry; pages (HTML rendered
// by entry.server.tsx) also get a Content-Security-Policy with a fresh nonce and a
// Permissions-Policy that lets only the runner use the camera.
// Sources: OWASP Secure Headers Project and CSP Cheat Sheet (nonce-based script-src, object-src
// 'none', base-uri, frame-ancestors 'none'); W3C Permissions Policy; RFC 6797 (HSTS only over TLS).

/** Powerful features no page uses. The camera is allowed on the runner only (photos of the job). */
const DENIED_FEATURES = ["camera", "microphone", "geolocation", "payment", "usb", "serial", "hid", "midi", "display-capture"];

/** The runner, where technicians take photos: /runs/:runId. */
export function takesPhotos(pathname: string): boolean {
  return /^\/runs\/[^/]+\/?$/.test(pathname);
}

export function permissionsPolicy(pathname: string): string {
  const camera = takesPhotos(pathname);
  return DENIED_FEATURES.map((f) => (f === "camera" && camera ? "camera=(self)" : `${f}=()`)).join(", ");
}

/** The page CSP: scripts only from this origin or carrying this response's nonce. */
export function contentSecurityPolicy(nonce: string, dev = false): string {
  return [
    "default-src 'self'",
    `script-src 'self' 'nonce-${nonce}'`,
    // Styles: React renders style attributes and the report embeds a stylesheet; CSS cannot run
    // script, so inline styles stay allowed (common practice; OWASP lists it as the usual trade-off).
    "style-src 'self' 'unsafe-inline'",
    // Step bodies may show images from https sites; photos preview from blob: URLs.
    "img-src 'self' data: blob: https:",
    "font-src 'self' data:",
    // Vite's dev server talks over a WebSocket for hot reload.
    dev ? "connect-src 'self' ws: wss:" : "connect-src 'self'",
    "media-src 'self' blob:",
    "worker-src 'self'",
    "manifest-src 'self'",
    "object-src 'none'",
    "base-uri 'self'",
    "form-action 'self'",
    "frame-ancestors 'none'",
  ].join("; ");
}

export function pageSecurityHeaders(options: { nonce: string; pathname: string; dev?: boolean }): Record<string, string> {
  return {
    "content-security-policy": contentSecurityPolicy(options.nonce, options.dev),
    "permissions-policy": permissionsPolicy(options.pathname),
  };
}

/** Headers for every response; a response's own CSP or Permissions-Policy (pages, photos) wins. */
export function baseSecurityHeaders(options: { tls: boolean; pathname: string }): Record<string, string> {
  return {
    "x-content-type-options": "nosniff",
    "referrer-policy": "same-origin",
    "x-frame-options": "DENY",
    // Not HTML: nothing may run or be framed (JSON, downloads, images).
    "content-security-policy": "default-src 'none'; frame-ancestors 'none'",
    "permissions-policy": permissionsPolicy(options.pathname),
    ...(options.tls ? { "strict-transport-security": "max-age=31536000" } : {}),
  };
}

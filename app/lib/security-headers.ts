// Security headers of every page and page-data response (app/entry.server.tsx), in one place.
// The content security policy allows only our own scripts (plus the inline hydration scripts
// React Router writes, by a per-request nonce), our own styles (inline style attributes too:
// React and the 3D viewer set them), images and fonts from us or data:/blob: URLs (the viewer's
// canvas snapshots), and fetches to our own origin; no frames, plugins or foreign forms, and
// no page of ours inside anyone's frame.
import { createContext } from "react";

/** The nonce of this response's inline scripts; undefined in the browser. */
export const NonceContext = createContext<string | undefined>(undefined);

export function contentSecurityPolicy(nonce: string, development: boolean): string {
  const script = development
    ? // the dev server injects its hot-reload client inline and evaluates modules
      "script-src 'self' 'unsafe-inline' 'unsafe-eval'"
    : `script-src 'self' 'nonce-${nonce}'`;
  return [
    "default-src 'self'",
    script,
    "style-src 'self' 'unsafe-inline'",
    "img-src 'self' data: blob:",
    "font-src 'self' data:",
    development ? "connect-src 'self' ws: wss:" : "connect-src 'self'",
    "worker-src 'self' blob:",
    "object-src 'none'",
    "base-uri 'self'",
    "form-action 'self'",
    "frame-src 'none'",
    "frame-ancestors 'none'",
  ].join("; ");
}

/** Set the headers on a page (or page data) response. */
export function applySecurityHeaders(headers: Headers, opts: { nonce?: string; development: boolean }): void {
  if (opts.nonce !== undefined) headers.set("Content-Security-Policy", contentSecurityPolicy(opts.nonce, opts.development));
  else if (!headers.has("Content-Security-Policy")) headers.set("Content-Security-Policy", "default-src 'none'; frame-ancestors 'none'");
  headers.set("X-Frame-Options", "DENY");
  headers.set("X-Content-Type-Options", "nosniff");
  headers.set("Referrer-Policy", "same-origin");
  headers.set("Cross-Origin-Opener-Policy", "same-origin");
  headers.set("Permissions-Policy", "camera=(), microphone=(), geolocation=(), payment=()");
}

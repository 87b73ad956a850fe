// Security headers of every response the app makes, in one place: pages (app/entry.server.tsx
// sets the page policy with its nonce) and everything else (the root route's middleware in
// app/root.tsx: page data, the JSON API, PDF, CSV and file downloads, error answers).
// The page content security policy allows only our own scripts (plus the inline hydration scripts
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

/**
 * The policy of a response that is not a page (JSON, PDF, CSV, a model file, an error): it may
 * load nothing and sit in nobody's frame, so a browser tricked into rendering one as a document
 * runs no script from it.
 */
export const RESOURCE_POLICY = "default-src 'none'; frame-ancestors 'none'";

/** Set the headers: the page policy with a nonce, else the resource policy unless one is set. */
export function applySecurityHeaders(headers: Headers, opts: { nonce?: string; development?: boolean } = {}): void {
  if (opts.nonce !== undefined) headers.set("Content-Security-Policy", contentSecurityPolicy(opts.nonce, opts.development ?? false));
  else if (!headers.has("Content-Security-Policy")) headers.set("Content-Security-Policy", RESOURCE_POLICY);
  headers.set("X-Frame-Options", "DENY");
  headers.set("X-Content-Type-Options", "nosniff");
  headers.set("Referrer-Policy", "same-origin");
  headers.set("Cross-Origin-Opener-Policy", "same-origin");
  headers.set("Permissions-Policy", "camera=(), microphone=(), geolocation=(), payment=()");
}

/**
 * The response with the headers set, keeping a policy already there (a page's, with its nonce).
 * A response whose headers are read-only (one passed on from fetch) is copied first, body
 * untouched.
 */
export function withSecurityHeaders(response: Response): Response {
  try {
    applySecurityHeaders(response.headers);
    return response;
  } catch {
    const copy = new Response(response.body, response);
    applySecurityHeaders(copy.headers);
    return copy;
  }
}

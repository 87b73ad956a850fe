import { isRouteErrorResponse, Links, Meta, Outlet, Scripts, ScrollRestoration } from "react-router";
import { useContext } from "react";
import type { Route } from "./+types/root";
import { z } from "zod";
import { NonceContext, withSecurityHeaders } from "~/lib/security-headers";
import "@fontsource/ibm-plex-sans/400.css";
import "@fontsource/ibm-plex-sans/500.css";
import "@fontsource/ibm-plex-sans/600.css";
import "@fontsource/roboto-mono/400.css";
import "@fontsource/roboto-mono/500.css";
import "./app.css";

// zod probes for eval (to compile its parsers) the first time it parses; the page policy
// forbids eval, so in the browser it is told not to try, instead of drawing a policy
// violation on every page. The server keeps the compiled parsers.
if (typeof document !== "undefined") z.config({ jitless: true });

// Every response passes here on its way out: pages, page data, the /api resource routes (JSON,
// PDF, CSV, file downloads) and their error answers get the security headers in one place.
export const middleware: Route.MiddlewareFunction[] = [
  async (_args, next) => {
    try {
      return withSecurityHeaders(await next());
    } catch (e) {
      throw e instanceof Response ? withSecurityHeaders(e) : e;
    }
  },
];

export const meta: Route.MetaFunction = () => [
  { title: "Strutwise — truss optimization desk" },
  { name: "description", content: "Size and shape trusses for minimum material, check and file the result." },
];

export const links: Route.LinksFunction = () => [{ rel: "icon", href: "/favicon.svg", type: "image/svg+xml" }];

export function Layout({ children }: { children: React.ReactNode }) {
  // the per-response nonce of the content security policy (entry.server.tsx)
  const nonce = useContext(NonceContext);
  return (
    <html lang="en">
      <head>
        <meta charSet="utf-8" />
        <meta name="viewport" content="width=device-width, initial-scale=1" />
        <Meta />
        <Links />
      </head>
      <body>
        {children}
        <ScrollRestoration nonce={nonce} />
        <Scripts nonce={nonce} />
      </body>
    </html>
  );
}

export default function App() {
  return <Outlet />;
}

export function ErrorBoundary({ error }: Route.ErrorBoundaryProps) {
  let title = "Something went wrong";
  let details = "An unexpected error occurred. The desk has logged it; try again, or go back.";
  let stack: string | undefined;

  if (isRouteErrorResponse(error)) {
    title = error.status === 404 ? "Not found" : `${error.status} ${error.statusText || "Error"}`;
    details =
      error.status === 404
        ? "There is nothing at this address. It may have been moved, or the link is mistyped."
        : typeof error.data === "string" && error.data
          ? error.data
          : (error.data?.error ?? details);
  } else if (import.meta.env.DEV && error instanceof Error) {
    details = error.message;
    stack = error.stack;
  }

  return (
    <main className="mx-auto max-w-2xl px-6 py-20">
      <p className="font-mono text-sm text-ink-muted">Strutwise</p>
      <h1 className="mt-2 text-3xl font-semibold text-ink">{title}</h1>
      <p className="mt-4 text-ink-soft">{details}</p>
      <a href="/" className="btn btn-secondary mt-8 inline-flex">Back to the desk</a>
      {stack && (
        <pre className="mt-8 overflow-x-auto rounded-md bg-ink p-4 font-mono text-xs text-paper">
          <code>{stack}</code>
        </pre>
      )}
    </main>
  );
}

import type { Config } from "@react-router/dev/config";

export default {
  ssr: true,
  // the root route's middleware puts the security headers on every response, resource routes
  // (the JSON API, downloads) included (app/lib/security-headers.ts)
  future: { v8_middleware: true },
} satisfies Config;

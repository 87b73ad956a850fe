import { type RouteConfig, index, layout, prefix, route } from "@react-router/dev/routes";

// The map of the app. Pages sit inside the shell layout; the JSON API and downloads are
// resource routes under /api (../docs: api.md).
export default [
  layout("routes/shell.tsx", [
    index("routes/home.tsx"),
  ]),
  ...prefix("api", [
    route("health", "routes/api/health.ts"),
  ]),
] satisfies RouteConfig;

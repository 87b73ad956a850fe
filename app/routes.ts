import { type RouteConfig, index, layout, prefix, route } from "@react-router/dev/routes";

// The map of the app. Pages sit inside the shell layout; the JSON API and downloads are
// resource routes under /api (../docs: api.md).
export default [
  layout("routes/shell.tsx", [
    index("routes/home.tsx"),
    route("sign-in", "routes/sign-in.tsx"),
    route("sign-up", "routes/sign-up.tsx"),
    route("sign-out", "routes/sign-out.tsx"),
    route("forgot-password", "routes/forgot-password.tsx"),
    route("reset-password", "routes/reset-password.tsx"),
    route("account", "routes/account.tsx"),
    route("projects", "routes/projects._index.tsx"),
    route("admin/users", "routes/admin.users.tsx"),
    route("admin/audit", "routes/admin.audit.tsx"),
    route("projects/:projectId", "routes/projects.$projectId.tsx"),
    route("models/:modelId", "routes/models.$modelId.tsx"),
    route("jobs", "routes/jobs._index.tsx"),
    route("jobs/:jobId", "routes/jobs.$jobId.tsx"),
    route("catalogues", "routes/catalogues._index.tsx"),
    route("catalogues/:catalogueId", "routes/catalogues.$catalogueId.tsx"),
    route("dev/inbox", "routes/dev.inbox.tsx"),
  ]),
  ...prefix("api", [
    route("health", "routes/api/health.ts"),
    route("auth/*", "routes/api/auth.$.ts"),
    route("projects", "routes/api/projects.ts"),
    route("jobs/:jobId/reviews", "routes/api/jobs.$jobId.reviews.ts"),
    route("jobs/:jobId/report", "routes/api/jobs.$jobId.report.ts"),
    route("models", "routes/api/models.ts"),
    route("models/:modelId", "routes/api/models.$modelId.ts"),
    route("models/:modelId/file", "routes/api/models.$modelId.file.ts"),
    route("models/:modelId/versions", "routes/api/models.$modelId.versions.ts"),
    route("jobs", "routes/api/jobs.ts"),
    route("jobs/:jobId", "routes/api/jobs.$jobId.ts"),
    route("jobs/:jobId/cancel", "routes/api/jobs.$jobId.cancel.ts"),
    route("jobs/:jobId/result", "routes/api/jobs.$jobId.result.ts"),
    route("jobs/:jobId/progress", "routes/api/jobs.$jobId.progress.ts"),
    route("catalogues", "routes/api/catalogues.ts"),
    route("catalogues/:catalogueId", "routes/api/catalogues.$catalogueId.ts"),
    route("catalogues/:catalogueId/retire", "routes/api/catalogues.$catalogueId.retire.ts"),
  ]),
] satisfies RouteConfig;

// Small helpers for loaders and actions: assert and throw a Response instead of nesting ifs.
// API routes answer { error, details } JSON (api.md); pages get the same Response and their
// ErrorBoundary words it.
export interface ErrorDetail {
  path: string;
  message: string;
}

export function jsonError(status: number, error: string, details?: ErrorDetail[] | unknown[]): Response {
  return Response.json(details ? { error, details } : { error }, { status, headers: { "Cache-Control": "no-store" } });
}

export function badRequest(error: string, details?: ErrorDetail[]): never {
  throw jsonError(400, error, details);
}

export function notFound(what: string): never {
  throw jsonError(404, `${what} not found`);
}

export function conflict(error: string): never {
  throw jsonError(409, error);
}

export function invariantResponse(condition: unknown, status: number, error: string): asserts condition {
  if (!condition) throw jsonError(status, error);
}

/** Parse a JSON request body, turning malformed JSON into a 400 that says so. */
export async function readJson(request: Request): Promise<unknown> {
  const text = await request.text();
  if (!text.trim()) return {};
  try {
    return JSON.parse(text);
  } catch {
    badRequest("The request body is not valid JSON");
  }
}

/** zod issues → api.md details */
export function zodDetails(issues: { path: PropertyKey[]; message: string }[]): ErrorDetail[] {
  return issues.map((i) => ({ path: i.path.map(String).join(".") || "(body)", message: i.message }));
}

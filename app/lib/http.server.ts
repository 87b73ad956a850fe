// Small helpers for loaders and actions: assert and throw a Response instead of nesting ifs.
// API routes answer { error, details } JSON (api.md); pages get the same Response and their
// ErrorBoundary words it.
import { findTooDeep, tooDeepMessage } from "./json-depth";
import { DEPENDENCY_WORDS, DependencyUnavailableError, describeError, isDatabaseUnavailable, type Dependency } from "./dependencies";
import { HeavyTaskStoppedError } from "./heavy-task";
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
  const deep = findTooDeep(text);
  if (deep) badRequest(tooDeepMessage("The request body", deep), [{ path: `(body) line ${deep.line}, column ${deep.column}`, message: "nested too deeply" }]);
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

/**
 * A service the request needs did not answer: 503 naming it ("storage", "database", "mail"),
 * with Retry-After, instead of a bare 500. The web process's own threads for heavy requests
 * count as such a service: a report or upload check they stopped or refused is a 503 too,
 * with the reason in words. Null for any other error.
 */
export function dependencyResponse(e: unknown): Response | null {
  if (e instanceof HeavyTaskStoppedError) {
    return Response.json(
      { error: e.message, limit: e.why === "time" ? "time" : "queue" },
      { status: 503, headers: { "Cache-Control": "no-store", "Retry-After": e.why === "time" ? "120" : "30" } },
    );
  }
  let dependency: Dependency | null = null;
  let reason = "";
  if (e instanceof DependencyUnavailableError) [dependency, reason] = [e.dependency, e.reason];
  else if (isDatabaseUnavailable(e)) [dependency, reason] = ["database", describeError(e)];
  if (!dependency) return null;
  const words = DEPENDENCY_WORDS[dependency];
  console.error(`[http] ${dependency} unavailable: ${reason}`);
  return Response.json(
    { error: `${words[0]!.toUpperCase()}${words.slice(1)} is not answering. Try again in a moment.`, dependency },
    { status: 503, headers: { "Cache-Control": "no-store", "Retry-After": "5" } },
  );
}

/**
 * Wraps a loader or action so that an unavailable service becomes dependencyResponse's 503;
 * Responses and every other error pass through unchanged.
 */
export function withDependencies<A extends unknown[], R>(fn: (...args: A) => Promise<R>): (...args: A) => Promise<R> {
  return async (...args: A) => {
    try {
      return await fn(...args);
    } catch (e) {
      if (e instanceof Response) throw e;
      throw dependencyResponse(e) ?? e;
    }
  };
}

// The services the app depends on, and the error that says one of them did not answer.
// Storage, database and mail code turn their clients' network and busy errors into this one
// error; the worker retries or hands the job back on it, and http.server.ts answers it with a
// 503 that names the service instead of a bare 500.
export type Dependency = "storage" | "database" | "mail";

export const DEPENDENCY_WORDS: Record<Dependency, string> = {
  storage: "the object store (models, results and reports)",
  database: "the database",
  mail: "the mail server",
};

export class DependencyUnavailableError extends Error {
  constructor(
    readonly dependency: Dependency,
    readonly reason: string,
  ) {
    super(`${DEPENDENCY_WORDS[dependency][0]!.toUpperCase()}${DEPENDENCY_WORDS[dependency].slice(1)} is not answering: ${reason}`);
    this.name = "DependencyUnavailableError";
  }
}

const NETWORK_CODES = new Set(["ECONNREFUSED", "ECONNRESET", "ETIMEDOUT", "EHOSTUNREACH", "ENETUNREACH", "ENOTFOUND", "EAI_AGAIN", "EPIPE", "ECONNABORTED", "UND_ERR_SOCKET", "UND_ERR_CONNECT_TIMEOUT"]);

/** The error, or one it wraps, is a network failure to reach a service (no answer at all). */
export function isNetworkError(e: unknown): boolean {
  for (let cur = e as { code?: unknown; errno?: unknown; name?: unknown; cause?: unknown; message?: unknown } | undefined, depth = 0; cur && depth < 5; depth++) {
    if (typeof cur.code === "string" && NETWORK_CODES.has(cur.code)) return true;
    if (cur.name === "TimeoutError" || cur.name === "RequestTimeout") return true;
    if (typeof cur.message === "string" && /ECONNREFUSED|ECONNRESET|socket hang up|ETIMEDOUT|EHOSTUNREACH/.test(cur.message)) return true;
    cur = cur.cause as typeof cur;
  }
  return false;
}

/** SQLite's "busy" and "locked" (another writer holds the lock past the busy timeout), or no database server. */
export function isDatabaseUnavailable(e: unknown): boolean {
  for (let cur = e as { code?: unknown; message?: unknown; cause?: unknown } | undefined, depth = 0; cur && depth < 5; depth++) {
    const code = typeof cur.code === "string" ? cur.code : "";
    const msg = typeof cur.message === "string" ? cur.message : "";
    if (/^SQLITE_(BUSY|LOCKED)/.test(code) || /SQLITE_BUSY|SQLITE_LOCKED|database is locked/.test(msg)) return true;
    cur = cur.cause as typeof cur;
  }
  return isNetworkError(e);
}

export function describeError(e: unknown): string {
  const msg = e instanceof Error ? e.message : String(e);
  return msg.replace(/\s+/g, " ").slice(0, 300);
}

// A local-file libSQL client that drops its connections after a "database is locked" failure.
//
// Why: when a write fails with SQLITE_BUSY (another process held the lock past the busy timeout),
// the libsql binding leaves the failed statement in progress instead of resetting it. Its
// connection goes back to the client's pool looking idle, but every later write on it joins an
// implicit transaction that is never committed: the caller is told the write succeeded, other
// connections never see it, and it is gone when the connection closes. Reported upstream as
// tursodatabase/libsql-client-ts#352 (fix proposed in tursodatabase/libsql-js#238, not released
// in libsql 0.5.29). Until it is, the only safe thing is to close every pooled connection the
// moment a busy failure surfaces; the pool opens fresh ones on the next call.
//
// Closing happens synchronously in the failing call's rejection, before its caller resumes. The
// only work that can slip in between is a caller already queued for a connection, and that queue
// exists only while interactive transactions hold every connection — which this app does not
// open (see client.server.ts). A transaction that is open elsewhere when the pool is dropped
// fails loudly on its next statement; it never loses a write silently.
import type { Client, Transaction } from "@libsql/client";

const busyCodes = /^SQLITE_BUSY/;

export function isBusyFailure(error: unknown): boolean {
  if (!error || typeof error !== "object") return false;
  const { code, extendedCode } = error as { code?: unknown; extendedCode?: unknown };
  return (typeof code === "string" && busyCodes.test(code)) || (typeof extendedCode === "string" && busyCodes.test(extendedCode));
}

/** Calls that reach the database, on a client and on its transactions. */
const DATABASE_CALLS = new Set<PropertyKey>(["execute", "batch", "executeMultiple", "migrate"]);

type AnyCall = (...args: unknown[]) => unknown;

/** Wraps `client` so that a busy failure in any call, or in any of its transactions, drops the pool. */
export function recoverFromBusy(client: Client): Client {
  const guard = async <T>(work: () => Promise<T>): Promise<T> => {
    try {
      return await work();
    } catch (error) {
      // reconnect() closes every pooled connection synchronously and reopens the pool
      if (isBusyFailure(error)) void client.reconnect();
      throw error;
    }
  };
  // one proxy shape for the client and its transactions (a transaction has no `transaction`)
  const guarded = <T extends Client | Transaction>(target: T): T =>
    new Proxy(target, {
      get(t, key) {
        const value = Reflect.get(t, key, t);
        if (typeof value !== "function") return value;
        const call = (...args: unknown[]) => (value as AnyCall).apply(t, args);
        if (key === "transaction") return async (...args: unknown[]) => guarded(await guard(() => call(...args) as Promise<Transaction>));
        if (DATABASE_CALLS.has(key)) return (...args: unknown[]) => guard(() => call(...args) as Promise<unknown>);
        return call;
      },
    });
  return guarded(client);
}

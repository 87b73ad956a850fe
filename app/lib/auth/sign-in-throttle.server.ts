// The sign-in throttle, in front of better-auth: every attempt counts against the ACCOUNT tried
// (whatever the body encoding: JSON, a form, multipart) and against the client's address, with
// rate-limiter-flexible counters stored in the database (so every server process shares them).
// Past the limit the attempt is refused with 429 before a password is checked, the right
// password included. Nothing is mailed on a lock-out, so hammering an account does not flood
// its owner's inbox. The per-address limit needs the address a reverse proxy puts in
// X-Forwarded-For; without one there is no trustworthy address and only the account counts.
import { RateLimiterDrizzle, RateLimiterRes } from "rate-limiter-flexible";
import { db as defaultDb, type Db } from "~/db/client.server";
import { signInThrottle } from "~/db/schema";

export interface Limit {
  max: number;
  window: number; // seconds
}

function parseLimit(text: string | undefined, fallback: Limit): Limit {
  const m = /^(\d+)\/(\d+)$/.exec(text ?? "");
  return m ? { max: Number(m[1]), window: Number(m[2]) } : fallback;
}

/** Attempts per account: AUTH_SIGN_IN_LIMIT="max/seconds", default 10 a minute. */
export function signInLimit(env = process.env): Limit {
  return parseLimit(env.AUTH_SIGN_IN_LIMIT, { max: 10, window: 60 });
}

/** Attempts per client address: AUTH_SIGN_IN_ADDRESS_LIMIT="max/seconds", default 60 a minute. */
export function addressLimit(env = process.env): Limit {
  return parseLimit(env.AUTH_SIGN_IN_ADDRESS_LIMIT, { max: 60, window: 60 });
}

const limiters = new WeakMap<Db, { account: RateLimiterDrizzle; address: RateLimiterDrizzle }>();
function limitersFor(database: Db) {
  let l = limiters.get(database);
  if (!l) {
    const a = signInLimit();
    const b = addressLimit();
    const common = { storeClient: database, schema: signInThrottle, clearExpiredByTimeout: false };
    l = {
      account: new RateLimiterDrizzle({ ...common, keyPrefix: "account", points: a.max, duration: a.window }),
      address: new RateLimiterDrizzle({ ...common, keyPrefix: "address", points: b.max, duration: b.window }),
    };
    limiters.set(database, l);
  }
  return l;
}

/** The e-mail a sign-in body names, whichever way it is encoded. */
export function emailOfBody(contentType: string, body: string): string {
  let email: unknown = "";
  if (/multipart\/form-data/i.test(contentType)) {
    const m = /name="email"\r?\n(?:[^\r\n]*\r?\n)*?\r?\n([^\r\n]*)/i.exec(body);
    email = m?.[1] ?? "";
  } else if (/application\/x-www-form-urlencoded/i.test(contentType)) {
    email = new URLSearchParams(body).get("email") ?? "";
  } else {
    try {
      email = (JSON.parse(body) as { email?: unknown })?.email ?? "";
    } catch {
      // better-auth answers the malformed body itself; the attempt still counts below
    }
    if (!email) email = new URLSearchParams(body).get("email") ?? ""; // a form sent without its type
  }
  return String(email).normalize("NFKC").trim().toLowerCase().slice(0, 320);
}

export function clientAddress(request: Request): string | null {
  return request.headers.get("x-forwarded-for")?.split(",")[0]?.trim() || null;
}

/**
 * Count one sign-in attempt. Returns null when it may go on, else the seconds to wait.
 * An attempt without a readable e-mail counts against the empty account, so garbage bodies
 * are throttled too.
 */
export async function countSignInAttempt(
  attempt: { email: string; address: string | null },
  database: Db = defaultDb(),
): Promise<number | null> {
  const l = limitersFor(database);
  try {
    await Promise.all([
      l.account.consume(attempt.email || "(none)"),
      attempt.address ? l.address.consume(attempt.address) : Promise.resolve(null),
    ]);
    return null;
  } catch (e) {
    if (e instanceof RateLimiterRes) return Math.max(1, Math.ceil(e.msBeforeNext / 1000));
    throw e;
  }
}

// Personal API keys for scripts: "swk_" + 32 random bytes (base64url). Only the sha256 of the
// key is kept; the key itself is shown once. A key acts with its owner's role as it is at the
// time of each request, so a demotion takes effect on the owner's keys at once.
import { createHash, randomBytes, randomUUID } from "node:crypto";
import { and, desc, eq, isNull, sql } from "drizzle-orm";
import { db as defaultDb, type Db } from "~/db/client.server";
import { apiKeys, user } from "~/db/schema";
import { audit } from "./audit.server";

const KEY_PREFIX = "swk_";

export function hashApiKey(key: string): string {
  return createHash("sha256").update(key, "utf8").digest("hex");
}

export type ApiKeyRow = typeof apiKeys.$inferSelect;
export type ApiKeyInfo = Omit<ApiKeyRow, "hash">;

export async function createApiKey(
  opts: { userId: string; email?: string; name: string; request?: Request },
  database: Db = defaultDb(),
): Promise<{ key: string; info: ApiKeyInfo }> {
  const name = opts.name.trim();
  if (!name) throw new Error("Give the key a name, so you can tell your keys apart later");
  if (name.length > 80) throw new Error("A key name has at most 80 characters");
  const key = KEY_PREFIX + randomBytes(32).toString("base64url");
  const id = randomUUID();
  const [row] = await database
    .insert(apiKeys)
    .values({ id, userId: opts.userId, name, prefix: key.slice(0, 12), hash: hashApiKey(key) })
    .returning();
  await audit(
    {
      request: opts.request,
      actor: { id: opts.userId, email: opts.email },
      action: "apikey.create",
      entityType: "api-key",
      entityId: id,
      detail: { name, prefix: row!.prefix },
    },
    database,
  );
  const { hash: _hash, ...info } = row!;
  return { key, info };
}

export async function listApiKeys(userId: string, database: Db = defaultDb()): Promise<ApiKeyInfo[]> {
  const rows = await database.select().from(apiKeys).where(eq(apiKeys.userId, userId)).orderBy(desc(apiKeys.createdAt));
  return rows.map(({ hash: _hash, ...info }) => info);
}

/** Every live key with its owner, for the admin's overview. */
export async function listAllLiveApiKeys(database: Db = defaultDb()) {
  return database
    .select({ id: apiKeys.id, name: apiKeys.name, prefix: apiKeys.prefix, createdAt: apiKeys.createdAt, lastUsedAt: apiKeys.lastUsedAt, ownerEmail: user.email })
    .from(apiKeys)
    .innerJoin(user, eq(user.id, apiKeys.userId))
    .where(isNull(apiKeys.revokedAt))
    .orderBy(desc(apiKeys.createdAt));
}

/**
 * Revoke a key. Owners revoke their own keys; `asAdmin` may revoke anyone's.
 * Returns false when there is no such (unrevoked) key for that caller.
 */
export async function revokeApiKey(
  opts: { id: string; actor: { id: string; email?: string }; asAdmin?: boolean; request?: Request },
  database: Db = defaultDb(),
): Promise<boolean> {
  const owned = opts.asAdmin ? eq(apiKeys.id, opts.id) : and(eq(apiKeys.id, opts.id), eq(apiKeys.userId, opts.actor.id));
  const done = await database
    .update(apiKeys)
    .set({ revokedAt: new Date() })
    .where(and(owned, isNull(apiKeys.revokedAt)))
    .returning({ id: apiKeys.id, name: apiKeys.name, userId: apiKeys.userId });
  if (!done.length) return false;
  await audit(
    {
      request: opts.request,
      actor: opts.actor,
      action: "apikey.revoke",
      entityType: "api-key",
      entityId: opts.id,
      detail: { name: done[0]!.name, owner: done[0]!.userId },
    },
    database,
  );
  return true;
}

// every API request runs this lookup: built and prepared once per database, not per call
const ownerQueries = new WeakMap<Db, ReturnType<typeof prepareOwnerQuery>>();
function prepareOwnerQuery(database: Db) {
  return database
    // only what authorization reads of the owner (authorize.server.ts toSessionUser)
    .select({
      keyId: apiKeys.id,
      lastUsedAt: apiKeys.lastUsedAt,
      user: { id: user.id, email: user.email, name: user.name, role: user.role, banned: user.banned, emailVerified: user.emailVerified },
    })
    .from(apiKeys)
    .innerJoin(user, eq(user.id, apiKeys.userId))
    .where(and(eq(apiKeys.hash, sql.placeholder("hash")), isNull(apiKeys.revokedAt)))
    .limit(1)
    .prepare();
}
function ownerQuery(database: Db) {
  let q = ownerQueries.get(database);
  if (!q) ownerQueries.set(database, (q = prepareOwnerQuery(database)));
  return q;
}

/** The owner of a live key, or null for an unknown, malformed or revoked key. */
export async function ownerOfApiKey(key: string, database: Db = defaultDb()) {
  if (!key.startsWith(KEY_PREFIX) || key.length > 200) return null;
  const rows = await ownerQuery(database).execute({ hash: hashApiKey(key) });
  const hit = rows[0];
  if (!hit) return null;
  // record use at most once a minute, to keep scripted bursts from writing on every call
  if (!hit.lastUsedAt || Date.now() - hit.lastUsedAt.getTime() > 60_000) {
    await database.update(apiKeys).set({ lastUsedAt: new Date() }).where(eq(apiKeys.id, hit.keyId));
  }
  return hit.user;
}

// Shared set-up for the queue tests: real services (temp database, S3 fake, mail catcher),
// migrations applied, and accounts, projects and models made the quick way.
import { randomUUID } from "node:crypto";
import { startTestServices, type TestServices } from "../../support/services";
import type { ModelJson } from "./models";

export async function setupQueue(envOverrides: Record<string, string> = {}) {
  const services: TestServices = await startTestServices();
  Object.assign(process.env, envOverrides);
  Object.assign(services.env, envOverrides);
  const { db } = await import("~/db/client.server");
  const { migrateDb } = await import("~/db/migrate.server");
  await migrateDb(db());
  return { services, db: db() };
}

/** A user row of the role with an API key (no password sign-in needed for these tests). */
export async function makeAccount(role: "admin" | "engineer" | "checker" | "viewer", name = `${role} ${randomUUID().slice(0, 4)}`) {
  const { db } = await import("~/db/client.server");
  const { user } = await import("~/db/schema");
  const { createApiKey } = await import("~/lib/auth/api-keys.server");
  const id = randomUUID();
  const email = `${name.replace(/\W+/g, ".").toLowerCase()}@harrowgate-eng.test`;
  const now = new Date();
  await db().insert(user).values({ id, name, email, emailVerified: true, role, createdAt: now, updatedAt: now });
  const { key } = await createApiKey({ userId: id, email, name: "queue tests" });
  return { id, email, name, role, key, sessionUser: { id, email, name, role, via: "api-key" as const } };
}

/** A project whose members are the given accounts; without a list, every account so far. */
export async function makeProject(code = `Q-${randomUUID().slice(0, 6)}`, members?: string[]) {
  const { db } = await import("~/db/client.server");
  const { projects, projectMembers, user } = await import("~/db/schema");
  const id = randomUUID();
  await db().insert(projects).values({ id, code, name: `Saltmarsh depot roof ${code}` });
  const memberIds = members ?? (await db().select({ id: user.id }).from(user)).map((u) => u.id);
  for (const userId of memberIds) await db().insert(projectMembers).values({ projectId: id, userId });
  return id;
}

/** Upload through storeModel, failing the test on a refusal. */
export async function uploadModel(projectId: string, model: ModelJson, userId: string | null = null) {
  const { storeModel } = await import("~/lib/models.server");
  const r = await storeModel({ projectId, fileName: "probe.truss.json", bytes: new TextEncoder().encode(JSON.stringify(model)), user: userId ? { id: userId } : null });
  if (!r.ok) throw new Error(`upload refused: ${r.error}`);
  return r.model;
}

/**
 * A model row and file put in place directly, skipping the upload checks: how a model that
 * the engine refuses at run time (e.g. after a rule change) reaches the worker.
 */
export async function insertUncheckedModel(projectId: string, model: ModelJson) {
  const { db } = await import("~/db/client.server");
  const { models } = await import("~/db/schema");
  const { putObject } = await import("~/lib/storage.server");
  const { modelFileKey } = await import("~/lib/jobs/keys");
  const id = randomUUID();
  const text = JSON.stringify(model);
  await putObject(modelFileKey(id), text, "application/json");
  await db()
    .insert(models)
    .values({
      id,
      projectId,
      name: String(model.name),
      fileName: "unchecked.truss.json",
      fileKey: modelFileKey(id),
      sha256: "0".repeat(64),
      sizeBytes: text.length,
      dimension: 2,
      nodeCount: 0,
      memberCount: 0,
      hasDesign: true,
      summary: {},
      warnings: [],
    });
  return id;
}

export async function waitFor<T>(what: string, fn: () => Promise<T | null | undefined | false>, timeoutMs = 20_000, everyMs = 50): Promise<T> {
  const end = Date.now() + timeoutMs;
  for (;;) {
    const v = await fn();
    if (v) return v;
    if (Date.now() > end) throw new Error(`timed out after ${timeoutMs} ms waiting for ${what}`);
    await new Promise((r) => setTimeout(r, everyMs));
  }
}

// Uploaded truss models: validate with the engine, keep the file in the bucket and the
// metadata in the database. Either both are stored or neither is.
import { DeleteObjectCommand } from "@aws-sdk/client-s3";
import { randomUUID } from "node:crypto";
import { and, desc, eq } from "drizzle-orm";
import { db as defaultDb, type Db } from "~/db/client.server";
import { models, modelVersions, projects } from "~/db/schema";
import { audit } from "~/lib/auth/audit.server";
import type { SessionUser } from "~/lib/auth/authorize.server";
import { config } from "~/lib/config.server";
import { memberScope, type Caller } from "~/lib/project-scope.server";
import type { ErrorDetail } from "~/lib/http.server";
import { getText, putObject, s3 } from "~/lib/storage.server";
import { modelFileKey } from "~/lib/jobs/keys";
import { checkModelUpload } from "~/lib/models/gate-on-thread.server";
import { tooLargeRefusal } from "~/lib/models/model-gate";

export { locateJsonError } from "~/lib/models/json-error";

export type ModelRow = typeof models.$inferSelect;

export interface ModelView {
  id: string;
  projectId: string;
  name: string;
  fileName: string;
  sha256: string;
  sizeBytes: number;
  dimension: number;
  nodeCount: number;
  memberCount: number;
  hasDesign: boolean;
  summary: unknown;
  warnings: ErrorDetail[];
  uploadedBy: string | null;
  createdAt: string;
}

export type StoreModelResult =
  | { ok: true; model: ModelView }
  | { ok: false; status: 400 | 404 | 413; error: string; details: ErrorDetail[] };

export function toModelView(r: ModelRow): ModelView {
  return {
    id: r.id,
    projectId: r.projectId,
    name: r.name,
    fileName: r.fileName,
    sha256: r.sha256,
    sizeBytes: r.sizeBytes,
    dimension: r.dimension,
    nodeCount: r.nodeCount,
    memberCount: r.memberCount,
    hasDesign: r.hasDesign,
    summary: r.summary,
    warnings: (r.warnings as ErrorDetail[]) ?? [],
    uploadedBy: r.uploadedBy,
    createdAt: r.createdAt.toISOString(),
  };
}

export function uploadTooLarge(fileName: string | null, size: number | null, limit = config().UPLOAD_LIMIT_BYTES): StoreModelResult & { ok: false } {
  return tooLargeRefusal(fileName, size, limit);
}

/**
 * Validate and store an uploaded model as its version 1. Order matters: every check first,
 * then the file in the bucket, then the rows (model and version in one batch); a failed
 * insert removes the file again.
 */
export async function storeModel(
  input: { projectId: string; fileName: string; bytes: Uint8Array; user: { id: string } | null; note?: string },
  database: Db = defaultDb(),
): Promise<StoreModelResult> {
  const { projectId, fileName, bytes } = input;
  const limit = config().UPLOAD_LIMIT_BYTES;
  if (bytes.byteLength > limit) return uploadTooLarge(fileName, bytes.byteLength, limit);

  const project = await database.select({ id: projects.id }).from(projects).where(eq(projects.id, projectId)).limit(1);
  if (!project[0]) {
    return { ok: false, status: 404, error: `Project ${projectId} not found`, details: [{ path: "projectId", message: "no such project" }] };
  }
  const gate = await checkModelUpload(fileName, bytes, limit);
  if (!gate.ok) return gate;
  const { model, summary, warnings, sha256 } = gate;

  const id = randomUUID();
  const key = modelFileKey(id);
  await putObject(key, bytes, "application/json");
  const facts = {
    name: model.name,
    fileName: fileName.slice(0, 255),
    fileKey: key,
    sha256,
    sizeBytes: bytes.byteLength,
    dimension: model.dimension,
    nodeCount: model.nodes.length,
    memberCount: model.members.length,
    hasDesign: model.design != null,
    summary,
    warnings,
  };
  try {
    const [[row]] = await database.batch([
      database
        .insert(models)
        .values({ id, projectId, ...facts, uploadedBy: input.user?.id ?? null })
        .returning(),
      database.insert(modelVersions).values({ id: randomUUID(), modelId: id, version: 1, ...facts, note: input.note ?? null, createdBy: input.user?.id ?? null }),
    ]);
    return { ok: true, model: toModelView(row!) };
  } catch (e) {
    await s3()
      .send(new DeleteObjectCommand({ Bucket: config().S3_BUCKET, Key: key }))
      .catch(() => undefined);
    throw e;
  }
}

export async function getModel(id: string, database: Db = defaultDb()): Promise<ModelView | null> {
  const rows = await database.select().from(models).where(eq(models.id, id)).limit(1);
  return rows[0] ? toModelView(rows[0]) : null;
}

/** Models newest first, of one project or all; `visibleTo` keeps the caller's projects only. */
export async function listModels(filter: { projectId?: string; visibleTo?: Caller } = {}, database: Db = defaultDb()): Promise<ModelView[]> {
  const rows = await database
    .select()
    .from(models)
    .where(and(filter.projectId ? eq(models.projectId, filter.projectId) : undefined, filter.visibleTo && memberScope(filter.visibleTo, models.projectId)))
    .orderBy(desc(models.createdAt), desc(models.id));
  return rows.map(toModelView);
}

/** A model of the project with exactly these bytes, if one was uploaded before. */
export async function findModelBySha(projectId: string, sha256: string, database: Db = defaultDb()): Promise<ModelView | null> {
  const rows = await database
    .select()
    .from(models)
    .where(and(eq(models.projectId, projectId), eq(models.sha256, sha256)))
    .limit(1);
  return rows[0] ? toModelView(rows[0]) : null;
}

/** The uploaded file as it was sent, or null for an unknown model. */
export async function getModelFile(id: string, database: Db = defaultDb()): Promise<{ fileName: string; text: string } | null> {
  const rows = await database.select({ fileKey: models.fileKey, fileName: models.fileName }).from(models).where(eq(models.id, id)).limit(1);
  if (!rows[0]) return null;
  const text = await getText(rows[0].fileKey);
  if (text === null) throw new Error(`The file of model ${id} is missing from storage (${rows[0].fileKey})`);
  return { fileName: rows[0].fileName, text };
}

/** The audit record of an upload; the page and the API write the same one. */
export async function auditUpload(
  request: Request,
  actor: SessionUser,
  m: { id: string; projectId: string; name: string; fileName: string; sha256: string; sizeBytes: number },
): Promise<void> {
  await audit({
    request,
    actor,
    action: "model.upload",
    entityType: "model",
    entityId: m.id,
    detail: { projectId: m.projectId, name: m.name, fileName: m.fileName, sha256: m.sha256, sizeBytes: m.sizeBytes },
  });
}

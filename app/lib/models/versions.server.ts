// Model versions: immutable, numbered from 1. A new version passes the same gate as an upload,
// its file goes to the bucket under its own key, then one batch adds the version row and
// copies its facts onto the model row (the latest version). Nothing is stored on refusal.
import { DeleteObjectCommand } from "@aws-sdk/client-s3";
import { randomUUID } from "node:crypto";
import { and, asc, desc, eq, max } from "drizzle-orm";
import { db as defaultDb, type Db } from "~/db/client.server";
import { models, modelVersions } from "~/db/schema";
import { config } from "~/lib/config.server";
import type { ErrorDetail } from "~/lib/http.server";
import { modelVersionFileKey } from "~/lib/jobs/keys";
import { getObjectStream, getText, putObject, s3 } from "~/lib/storage.server";
import { checkModelUpload } from "./gate-on-thread.server";

export type ModelVersionRow = typeof modelVersions.$inferSelect;

export interface ModelVersionView {
  version: number;
  name: string;
  sha256: string;
  sizeBytes: number;
  nodeCount: number;
  memberCount: number;
  hasDesign: boolean;
  summary: unknown;
  warnings: ErrorDetail[];
  note: string | null;
  createdBy: string | null;
  createdAt: string;
}

export type CreateVersionResult =
  | { ok: true; modelId: string; projectId: string; version: ModelVersionView }
  | { ok: false; status: 400 | 404 | 409 | 413; error: string; details: ErrorDetail[] };

export function toVersionView(r: ModelVersionRow): ModelVersionView {
  return {
    version: r.version,
    name: r.name,
    sha256: r.sha256,
    sizeBytes: r.sizeBytes,
    nodeCount: r.nodeCount,
    memberCount: r.memberCount,
    hasDesign: r.hasDesign,
    summary: r.summary,
    warnings: (r.warnings as ErrorDetail[]) ?? [],
    note: r.note,
    createdBy: r.createdBy,
    createdAt: r.createdAt.toISOString(),
  };
}

const NOTE_MAX = 500;

/**
 * Add the next version of a model. Two saves at once both pass the gate; the unique
 * (model, version) index lets one of them win and the other retries with the next number.
 */
export async function createModelVersion(
  input: { modelId: string; fileName: string; bytes: Uint8Array; note?: string | null; user: { id: string } | null },
  database: Db = defaultDb(),
): Promise<CreateVersionResult> {
  const [model] = await database.select({ id: models.id, projectId: models.projectId }).from(models).where(eq(models.id, input.modelId)).limit(1);
  if (!model) return { ok: false, status: 404, error: `Model ${input.modelId} not found`, details: [{ path: "modelId", message: "no such model" }] };
  const note = input.note?.trim() || null;
  if (note && note.length > NOTE_MAX) {
    return { ok: false, status: 400, error: `The note is ${note.length} characters; at most ${NOTE_MAX} fit`, details: [{ path: "note", message: `at most ${NOTE_MAX} characters` }] };
  }
  const gate = await checkModelUpload(input.fileName, input.bytes, config().UPLOAD_LIMIT_BYTES);
  if (!gate.ok) return gate;
  const { model: parsed, summary, warnings, sha256 } = gate;

  for (let attempt = 0; attempt < 5; attempt++) {
    const [{ latest }] = (await database.select({ latest: max(modelVersions.version) }).from(modelVersions).where(eq(modelVersions.modelId, model.id))) as [{ latest: number | null }];
    const version = (latest ?? 0) + 1;
    const key = modelVersionFileKey(model.id, version);
    const facts = {
      name: parsed.name,
      fileName: input.fileName.slice(0, 255),
      fileKey: key,
      sha256,
      sizeBytes: input.bytes.byteLength,
      dimension: parsed.dimension,
      nodeCount: parsed.nodes.length,
      memberCount: parsed.members.length,
      hasDesign: parsed.design != null,
      summary,
      warnings,
    };
    await putObject(key, input.bytes, "application/json");
    try {
      const [[row]] = await database.batch([
        database
          .insert(modelVersions)
          .values({ id: randomUUID(), modelId: model.id, version, ...facts, note, createdBy: input.user?.id ?? null })
          .returning(),
        database.update(models).set(facts).where(eq(models.id, model.id)),
      ]);
      return { ok: true, modelId: model.id, projectId: model.projectId, version: toVersionView(row!) };
    } catch (e) {
      if (isUniqueViolation(e)) continue; // someone saved that number first: same key, their bytes win
      await s3()
        .send(new DeleteObjectCommand({ Bucket: config().S3_BUCKET, Key: key }))
        .catch(() => undefined);
      throw e;
    }
  }
  return { ok: false, status: 409, error: "Several versions were being saved at once; save again", details: [{ path: "version", message: "conflicting saves" }] };
}

function isUniqueViolation(e: unknown): boolean {
  const text = `${(e as Error)?.message ?? ""} ${((e as { cause?: Error }).cause?.message ?? "")}`;
  return /UNIQUE constraint failed/i.test(text);
}

export async function listModelVersions(modelId: string, database: Db = defaultDb()): Promise<ModelVersionView[]> {
  const rows = await database.select().from(modelVersions).where(eq(modelVersions.modelId, modelId)).orderBy(asc(modelVersions.version));
  return rows.map(toVersionView);
}

/** One version's row; the latest without a number. */
export async function getModelVersion(modelId: string, version: number | null, database: Db = defaultDb()): Promise<ModelVersionRow | null> {
  const rows = await database
    .select()
    .from(modelVersions)
    .where(version === null ? eq(modelVersions.modelId, modelId) : and(eq(modelVersions.modelId, modelId), eq(modelVersions.version, version)))
    .orderBy(desc(modelVersions.version))
    .limit(1);
  return rows[0] ?? null;
}

/** The file of one version (the latest without a number), or null for an unknown model or version. */
export async function getModelVersionFile(
  modelId: string,
  version: number | null,
  database: Db = defaultDb(),
): Promise<{ fileName: string; version: number; text: string } | null> {
  const row = await getModelVersion(modelId, version, database);
  if (!row) return null;
  const text = await getText(row.fileKey);
  if (text === null) throw new Error(`The file of model ${modelId} version ${row.version} is missing from storage (${row.fileKey})`);
  return { fileName: row.fileName, version: row.version, text };
}

/** The same file as a stream with its length, for the download route. */
export async function getModelVersionStream(modelId: string, version: number | null, database: Db = defaultDb()) {
  const row = await getModelVersion(modelId, version, database);
  if (!row) return null;
  const stored = await getObjectStream(row.fileKey);
  if (stored === null) throw new Error(`The file of model ${modelId} version ${row.version} is missing from storage (${row.fileKey})`);
  return { fileName: row.fileName, version: row.version, ...stored };
}

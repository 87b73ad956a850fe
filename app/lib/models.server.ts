// Uploaded truss models: validate with the engine, keep the file in the bucket and the
// metadata in the database. Either both are stored or neither is.
import { DeleteObjectCommand } from "@aws-sdk/client-s3";
import { createHash, randomUUID } from "node:crypto";
import { and, desc, eq } from "drizzle-orm";
import { db as defaultDb, type Db } from "~/db/client.server";
import { models, projects } from "~/db/schema";
import { parseModel } from "~/engine/truss";
import { audit } from "~/lib/auth/audit.server";
import type { SessionUser } from "~/lib/auth/authorize.server";
import { config } from "~/lib/config.server";
import type { ErrorDetail } from "~/lib/http.server";
import { getText, putObject, s3 } from "~/lib/storage.server";
import { modelFileKey } from "~/lib/jobs/keys";

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

const mb = (n: number) => `${(n / (1024 * 1024)).toFixed(n < 1024 * 1024 ? 2 : 1)} MB`;

export function uploadTooLarge(fileName: string | null, size: number | null, limit = config().UPLOAD_LIMIT_BYTES): StoreModelResult & { ok: false } {
  const what = fileName ? `The file ${fileName}` : "The upload";
  const error = size === null ? `${what} is larger than the upload limit of ${mb(limit)}` : `${what} is ${mb(size)}, larger than the upload limit of ${mb(limit)}`;
  return { ok: false, status: 413, error, details: [{ path: "file", message: `over the upload limit of ${limit} bytes` }] };
}

/**
 * Validate and store an uploaded model. Order matters: every check first, then the file in
 * the bucket, then the row; a failed insert removes the file again.
 */
export async function storeModel(
  input: { projectId: string; fileName: string; bytes: Uint8Array; user: { id: string } | null },
  database: Db = defaultDb(),
): Promise<StoreModelResult> {
  const { projectId, fileName, bytes } = input;
  const limit = config().UPLOAD_LIMIT_BYTES;
  if (bytes.byteLength > limit) return uploadTooLarge(fileName, bytes.byteLength, limit);
  if (bytes.byteLength === 0) return invalid(`The file ${fileName} is empty`, [{ path: "file", message: "no content" }]);

  const project = await database.select({ id: projects.id }).from(projects).where(eq(projects.id, projectId)).limit(1);
  if (!project[0]) {
    return { ok: false, status: 404, error: `Project ${projectId} not found`, details: [{ path: "projectId", message: "no such project" }] };
  }

  let text: string;
  try {
    text = new TextDecoder("utf-8", { fatal: true }).decode(bytes);
  } catch {
    return invalid(`The file ${fileName} is not UTF-8 text`, [{ path: "file", message: "not UTF-8 encoded text" }]);
  }
  if (text.charCodeAt(0) === 0xfeff) text = text.slice(1); // editors on some systems add a BOM

  let json: unknown;
  try {
    json = JSON.parse(text);
  } catch (e) {
    const at = locateJsonError(text);
    const where = `line ${at.line}, column ${at.column}`;
    return invalid(`The file ${fileName} is not valid JSON: ${at.message} at ${where}`, [
      { path: `(file) ${where}`, message: at.message || (e as Error).message },
    ]);
  }

  const parsed = parseModel(json);
  if (!parsed.ok) {
    const n = parsed.errors.length;
    return invalid(`The model in ${fileName} has ${n} problem${n === 1 ? "" : "s"}; the first: ${parsed.errors[0]?.path}: ${parsed.errors[0]?.message}`, parsed.errors);
  }
  const { model, summary, warnings } = parsed;

  const id = randomUUID();
  const key = modelFileKey(id);
  const sha256 = createHash("sha256").update(bytes).digest("hex");
  await putObject(key, bytes, "application/json");
  try {
    const [row] = await database
      .insert(models)
      .values({
        id,
        projectId,
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
        uploadedBy: input.user?.id ?? null,
      })
      .returning();
    return { ok: true, model: toModelView(row!) };
  } catch (e) {
    await s3()
      .send(new DeleteObjectCommand({ Bucket: config().S3_BUCKET, Key: key }))
      .catch(() => undefined);
    throw e;
  }
}

function invalid(error: string, details: ErrorDetail[]): StoreModelResult {
  return { ok: false, status: 400, error, details };
}

export async function getModel(id: string, database: Db = defaultDb()): Promise<ModelView | null> {
  const rows = await database.select().from(models).where(eq(models.id, id)).limit(1);
  return rows[0] ? toModelView(rows[0]) : null;
}

export async function listModels(filter: { projectId?: string } = {}, database: Db = defaultDb()): Promise<ModelView[]> {
  const rows = await database
    .select()
    .from(models)
    .where(filter.projectId ? eq(models.projectId, filter.projectId) : undefined)
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

/**
 * Where a JSON text first breaks the grammar (RFC 8259), as line and column (1-based) with a
 * short reason. JSON.parse on Node 20 does not always say where; this walk does.
 */
export function locateJsonError(text: string): { line: number; column: number; message: string } {
  let i = 0;
  const fail = (message: string): never => {
    throw Object.assign(new Error(message), { offset: i });
  };
  const ws = () => {
    while (i < text.length && " \t\n\r".includes(text[i]!)) i++;
  };
  const literal = (word: string) => {
    if (text.startsWith(word, i)) i += word.length;
    else fail(`unexpected ${describe(text[i])}`);
  };
  const string = () => {
    i++; // opening quote
    while (i < text.length) {
      const c = text[i]!;
      if (c === '"') return void i++;
      if (c === "\\") {
        const e = text[i + 1];
        if (e === "u") {
          if (!/^[0-9a-fA-F]{4}$/.test(text.slice(i + 2, i + 6))) fail("bad \\u escape in a string");
          i += 6;
        } else if (e !== undefined && '"\\/bfnrt'.includes(e)) i += 2;
        else fail("bad escape in a string");
      } else if (c.charCodeAt(0) < 0x20) fail("line break or control character inside a string");
      else i++;
    }
    fail("a string is not closed");
  };
  const number = () => {
    const m = /^-?(0|[1-9]\d*)(\.\d+)?([eE][+-]?\d+)?/.exec(text.slice(i, i + 400));
    if (!m) fail(`unexpected ${describe(text[i])}`);
    i += m![0].length;
  };
  const value = (): void => {
    ws();
    const c = text[i];
    if (c === undefined) fail("the file ends where a value was expected");
    if (c === "{") {
      i++;
      ws();
      if (text[i] === "}") return void i++;
      for (;;) {
        ws();
        if (text[i] !== '"') fail(`expected a property name in double quotes, found ${describe(text[i])}`);
        string();
        ws();
        if (text[i] !== ":") fail(`expected ':' after a property name, found ${describe(text[i])}`);
        i++;
        value();
        ws();
        if (text[i] === ",") {
          i++;
          continue;
        }
        if (text[i] === "}") return void i++;
        fail(`expected ',' or '}' in an object, found ${describe(text[i])}`);
      }
    }
    if (c === "[") {
      i++;
      ws();
      if (text[i] === "]") return void i++;
      for (;;) {
        value();
        ws();
        if (text[i] === ",") {
          i++;
          continue;
        }
        if (text[i] === "]") return void i++;
        fail(`expected ',' or ']' in a list, found ${describe(text[i])}`);
      }
    }
    if (c === '"') return string();
    if (c === "t") return literal("true");
    if (c === "f") return literal("false");
    if (c === "n") return literal("null");
    return number();
  };
  let message = "";
  try {
    value();
    ws();
    if (i < text.length) fail(`unexpected ${describe(text[i])} after the end of the document`);
  } catch (e) {
    message = (e as Error).message;
  }
  const before = text.slice(0, i);
  const line = before.split("\n").length;
  const column = i - (before.lastIndexOf("\n") + 1) + 1;
  return { line, column, message };
}

function describe(c: string | undefined): string {
  if (c === undefined) return "the end of the file";
  if (c === "\n" || c === "\r") return "a line break";
  return `'${c}'`;
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

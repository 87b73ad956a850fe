// The desk's section catalogues: upload (CSV, checked whole before anything is stored), list,
// view, retire, and the copy a model takes at upload. Callers check the role first
// (read:catalogue, manage:catalogue); these functions return domain errors, never throw them.
import { createHash, randomUUID } from "node:crypto";
import { and, desc, eq, isNull, sql } from "drizzle-orm";
import { alias } from "drizzle-orm/sqlite-core";
import { db as defaultDb, type Db } from "~/db/client.server";
import { sectionCatalogues, user } from "~/db/schema";
import { audit } from "~/lib/auth/audit.server";
import type { SessionUser } from "~/lib/auth/authorize.server";
import { config } from "~/lib/config.server";
import type { ErrorDetail } from "~/lib/http.server";
import { applyCatalogue } from "./apply";
import { builtInCatalogue } from "./built-in";
import { parseCatalogueCsv } from "./csv";
import { BUILT_IN_CATALOGUE_ID, type Catalogue, type CatalogueSection, type CatalogueSummary } from "./types";

export type CatalogueFailure = { ok: false; status: 400 | 404 | 409 | 413; error: string; details: ErrorDetail[] };

const MAX_NAME = 120;
const MAX_DESCRIPTION = 2000;

const retirer = alias(user, "retirer");

function summaryColumns() {
  return {
    row: sectionCatalogues,
    createdByName: user.name,
    createdByEmail: user.email,
    retiredByName: retirer.name,
    retiredByEmail: retirer.email,
  };
}

type Joined = {
  row: typeof sectionCatalogues.$inferSelect;
  createdByName: string | null;
  createdByEmail: string | null;
  retiredByName: string | null;
  retiredByEmail: string | null;
};

function toSummary(j: Joined): CatalogueSummary {
  const r = j.row;
  return {
    id: r.id,
    name: r.name,
    description: r.description,
    builtIn: false,
    sectionCount: r.sectionCount,
    families: r.families as string[],
    fileName: r.fileName,
    sha256: r.sha256,
    createdAt: r.createdAt.toISOString(),
    createdBy: j.createdByName || j.createdByEmail,
    retiredAt: r.retiredAt ? r.retiredAt.toISOString() : null,
    retiredBy: r.retiredAt ? j.retiredByName || j.retiredByEmail : null,
    retireReason: r.retireReason,
  };
}

function joined(database: Db) {
  return database
    .select(summaryColumns())
    .from(sectionCatalogues)
    .leftJoin(user, eq(user.id, sectionCatalogues.createdBy))
    .leftJoin(retirer, eq(retirer.id, sectionCatalogues.retiredBy));
}

/** The built-in catalogue first, then stored ones newest first; retired ones only when asked. */
export async function listCatalogues(opts: { includeRetired?: boolean } = {}, database: Db = defaultDb()): Promise<CatalogueSummary[]> {
  const rows = await joined(database)
    .where(opts.includeRetired ? undefined : isNull(sectionCatalogues.retiredAt))
    .orderBy(desc(sectionCatalogues.createdAt), desc(sectionCatalogues.id));
  const { sections: _sections, dimensionNames: _dimensions, ...builtIn } = builtInCatalogue();
  return [builtIn, ...rows.map(toSummary)];
}

export async function getCatalogue(id: string, database: Db = defaultDb()): Promise<Catalogue | null> {
  if (id === BUILT_IN_CATALOGUE_ID) return builtInCatalogue();
  const [j] = await joined(database).where(eq(sectionCatalogues.id, id)).limit(1);
  if (!j) return null;
  return { ...toSummary(j), sections: j.row.sections as CatalogueSection[], dimensionNames: j.row.dimensionNames as string[] };
}

/**
 * Check and store an uploaded CSV catalogue. Every check runs first (name, size, encoding,
 * every row); one insert follows, so a refused file leaves nothing behind.
 */
export async function storeCatalogue(
  input: { name: string; description?: string | null; fileName: string; bytes: Uint8Array; user: SessionUser | { id: string } | null; request?: Request },
  database: Db = defaultDb(),
): Promise<{ ok: true; catalogue: Catalogue } | CatalogueFailure> {
  const name = input.name.trim();
  const description = input.description?.trim() || null;
  const fileName = (input.fileName || "catalogue.csv").slice(0, 255);
  const details: ErrorDetail[] = [];
  if (!name) details.push({ path: "name", message: "required: a name people will recognise in the pick list" });
  else if (name.length > MAX_NAME) details.push({ path: "name", message: `at most ${MAX_NAME} characters` });
  if (description && description.length > MAX_DESCRIPTION) details.push({ path: "description", message: `at most ${MAX_DESCRIPTION} characters` });
  if (details.length) return { ok: false, status: 400, error: "The catalogue needs a name", details };

  const limit = config().UPLOAD_LIMIT_BYTES;
  if (input.bytes.byteLength > limit) {
    return { ok: false, status: 413, error: `${fileName} is larger than the upload limit of ${limit} bytes`, details: [{ path: "file", message: `over the upload limit of ${limit} bytes` }] };
  }
  let text: string;
  try {
    text = new TextDecoder("utf-8", { fatal: true }).decode(input.bytes);
  } catch {
    return { ok: false, status: 400, error: `${fileName} is not UTF-8 text`, details: [{ path: "file", message: "save the sheet as CSV UTF-8" }] };
  }
  const parsed = parseCatalogueCsv(text, fileName);
  if (!parsed.ok) return { ok: false, status: 400, error: parsed.error, details: parsed.details };

  const clash = await database
    .select({ id: sectionCatalogues.id })
    .from(sectionCatalogues)
    .where(and(isNull(sectionCatalogues.retiredAt), sql`lower(${sectionCatalogues.name}) = lower(${name})`))
    .limit(1);
  if (clash[0] || name.toLowerCase() === builtInCatalogue().name.toLowerCase()) {
    return { ok: false, status: 409, error: `A catalogue named "${name}" is already in use`, details: [{ path: "name", message: "choose another name, or retire the catalogue of that name first" }] };
  }

  const id = randomUUID();
  const sha256 = createHash("sha256").update(input.bytes).digest("hex");
  await database.insert(sectionCatalogues).values({
    id,
    name,
    description,
    fileName,
    sha256,
    sectionCount: parsed.sections.length,
    families: parsed.families,
    dimensionNames: parsed.dimensionNames,
    sections: parsed.sections,
    createdBy: input.user?.id ?? null,
  });
  await audit(
    { request: input.request, actor: input.user, action: "catalogue.upload", entityType: "catalogue", entityId: id, detail: { name, fileName, sha256, sections: parsed.sections.length } },
    database,
  );
  return { ok: true, catalogue: (await getCatalogue(id, database))! };
}

/** Take a catalogue out of the pick lists. Idempotent refusals: 404 unknown, 409 built-in or retired. */
export async function retireCatalogue(
  input: { id: string; reason?: string | null; user: SessionUser; request?: Request },
  database: Db = defaultDb(),
): Promise<{ ok: true; catalogue: Catalogue } | CatalogueFailure> {
  if (input.id === BUILT_IN_CATALOGUE_ID) {
    return { ok: false, status: 409, error: "The built-in catalogue belongs to the desk and cannot be retired", details: [] };
  }
  const current = await getCatalogue(input.id, database);
  if (!current) return { ok: false, status: 404, error: `Catalogue ${input.id} not found`, details: [] };
  if (current.retiredAt) return { ok: false, status: 409, error: `The catalogue "${current.name}" was retired on ${current.retiredAt.slice(0, 10)}`, details: [] };
  const reason = input.reason?.trim().slice(0, 500) || null;
  await database
    .update(sectionCatalogues)
    .set({ retiredAt: new Date(), retiredBy: input.user.id, retireReason: reason })
    .where(and(eq(sectionCatalogues.id, input.id), isNull(sectionCatalogues.retiredAt)));
  await audit({ request: input.request, actor: input.user, action: "catalogue.retire", entityType: "catalogue", entityId: input.id, detail: { name: current.name, reason } }, database);
  return { ok: true, catalogue: (await getCatalogue(input.id, database))! };
}

/**
 * An uploaded model file with a catalogue's sections copied in (the upload form's and the
 * API's `catalogueId`, `catalogueFamilies`). A file that is not JSON passes through untouched:
 * the model upload itself names its syntax error. A retired catalogue is refused.
 */
export async function withCatalogueSections(
  input: { bytes: Uint8Array; catalogueId: string; families?: string[] },
  database: Db = defaultDb(),
): Promise<{ ok: true; bytes: Uint8Array; catalogue: { id: string; name: string }; sectionCount: number; warnings: ErrorDetail[] } | CatalogueFailure | { ok: "not-json" }> {
  const catalogue = await getCatalogue(input.catalogueId, database);
  if (!catalogue) return { ok: false, status: 400, error: `Catalogue ${input.catalogueId} not found`, details: [{ path: "catalogueId", message: "no such catalogue" }] };
  if (catalogue.retiredAt) {
    return { ok: false, status: 400, error: `The catalogue "${catalogue.name}" is retired`, details: [{ path: "catalogueId", message: "retired catalogues are not offered to new models; pick another" }] };
  }
  let json: unknown;
  try {
    let text = new TextDecoder("utf-8", { fatal: true }).decode(input.bytes);
    if (text.charCodeAt(0) === 0xfeff) text = text.slice(1);
    json = JSON.parse(text);
  } catch {
    return { ok: "not-json" };
  }
  const applied = applyCatalogue(json, catalogue, input.families ?? []);
  if (!applied.ok) return { ok: false, status: 400, error: applied.error, details: applied.details };
  return {
    ok: true,
    bytes: new TextEncoder().encode(JSON.stringify(applied.model, null, 2) + "\n"),
    catalogue: { id: catalogue.id, name: catalogue.name },
    sectionCount: applied.sectionCount,
    warnings: applied.warnings,
  };
}

/** "CHS, SHS" or ["CHS","SHS"] from a form or JSON field → a clean list. */
export function familyList(value: unknown): string[] {
  const parts = Array.isArray(value) ? value.map(String) : typeof value === "string" ? value.split(",") : [];
  return [...new Set(parts.map((s) => s.trim()).filter(Boolean))];
}

/**
 * The upload forms' catalogue option (page and API alike): with a `catalogueId` field the
 * file's bytes come back with that catalogue's sections in them; without it, unchanged.
 */
export async function sectionsFromUploadForm(
  form: { get(name: string): unknown },
  bytes: Uint8Array,
  database: Db = defaultDb(),
): Promise<{ ok: true; bytes: Uint8Array; catalogue: { id: string; name: string; sectionCount: number } | null; warnings: ErrorDetail[] } | CatalogueFailure> {
  const raw = form.get("catalogueId");
  const catalogueId = typeof raw === "string" ? raw.trim() : "";
  if (!catalogueId) return { ok: true, bytes, catalogue: null, warnings: [] };
  const applied = await withCatalogueSections({ bytes, catalogueId, families: familyList(form.get("catalogueFamilies")) }, database);
  if (applied.ok === "not-json") return { ok: true, bytes, catalogue: null, warnings: [] };
  if (!applied.ok) return applied;
  return { ok: true, bytes: applied.bytes, catalogue: { ...applied.catalogue, sectionCount: applied.sectionCount }, warnings: applied.warnings };
}

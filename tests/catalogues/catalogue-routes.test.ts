// Section catalogue routes and service, called in-process with real API keys on a migrated
// temp database: who may upload, read and retire; bad CSVs refused with every row named and
// nothing stored; a model upload taking its sections from a stored catalogue.
import { count } from "drizzle-orm";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import type { Db } from "~/db/client.server";
import type { TestServices } from "../support/services";
import { twoBarModel } from "../queue/support/models";
import { makeAccount, makeProject, setupQueue } from "../queue/support/setup";

let services: TestServices;
let database: Db;
let projectId: string;
let admin: Awaited<ReturnType<typeof makeAccount>>;
let engineer: Awaited<ReturnType<typeof makeAccount>>;
let checker: Awaited<ReturnType<typeof makeAccount>>;
let viewer: Awaited<ReturnType<typeof makeAccount>>;

beforeAll(async () => {
  ({ services, db: database } = await setupQueue());
  admin = await makeAccount("admin", "Ines Vantongeren");
  engineer = await makeAccount("engineer", "Odile Marchbank");
  checker = await makeAccount("checker", "Bram Yelverton");
  viewer = await makeAccount("viewer", "Lotte Quarrie");
  projectId = await makeProject();
});
afterAll(async () => services?.stop());

const url = (p: string) => `http://localhost:5410${p}`;
const auth = (key: string) => ({ authorization: `Bearer ${key}` });
async function call(fn: (a: never) => Promise<unknown>, request: Request, params: Record<string, string> = {}): Promise<Response> {
  try {
    return (await fn({ request, params, context: {} } as never)) as Response;
  } catch (e) {
    if (e instanceof Response) return e;
    throw e;
  }
}

const GOOD = "id,family,area_mm2,I_mm4,D_mm,t_mm\nT 60x3,tube,537.2,218780,60,3\nT 76x4,tube,904.8,588110,76,4\nR 20,rod,314.16,7854,20,\n";

function uploadRequest(key: string, fields: { name?: string; csv?: string; fileName?: string }) {
  const form = new FormData();
  if (fields.name !== undefined) form.set("name", fields.name);
  if (fields.csv !== undefined) form.set("file", new Blob([fields.csv], { type: "text/csv" }), fields.fileName ?? "stock.csv");
  return new Request(url("/api/catalogues"), { method: "POST", body: form, headers: auth(key) });
}

async function upload(key: string, fields: { name?: string; csv?: string; fileName?: string }) {
  const route = await import("~/routes/api/catalogues");
  return call(route.action, uploadRequest(key, fields));
}

async function storedRows() {
  const { sectionCatalogues } = await import("~/db/schema");
  return (await database.select({ n: count() }).from(sectionCatalogues))[0]!.n;
}

describe("catalogue upload", () => {
  it("an engineer uploads a CSV: 201 with the sections in mm; everyone signed in lists and reads it", async () => {
    const res = await upload(engineer.key, { name: "Quarry yard stock", csv: GOOD });
    expect(res.status).toBe(201);
    const body = (await res.json()) as { id: string; sectionCount: number; families: string[]; sections: { id: string; dimensions?: Record<string, number> }[]; createdBy: string };
    expect(body).toMatchObject({ sectionCount: 3, families: ["tube", "rod"], createdBy: "Odile Marchbank" });
    expect(body.sections[2]).toEqual({ id: "R 20", family: "rod", area: 314.16, I: 7854, dimensions: { D: 20 } });

    const list = await import("~/routes/api/catalogues");
    const one = await import("~/routes/api/catalogues.$catalogueId");
    for (const who of [viewer, checker]) {
      const l = (await (await call(list.loader, new Request(url("/api/catalogues"), { headers: auth(who.key) }))).json()) as { catalogues: { id: string }[] };
      expect(l.catalogues.map((c) => c.id)).toContain(body.id);
      const g = await call(one.loader, new Request(url(`/api/catalogues/${body.id}`), { headers: auth(who.key) }), { catalogueId: body.id });
      expect(g.status).toBe(200);
      expect(((await g.json()) as { units: { I: string } }).units.I).toBe("mm⁴");
    }
    const { listAudit } = await import("~/lib/auth/audit.server");
    expect((await listAudit({ action: "catalogue.upload", limit: 5 })).some((e) => e.entityId === body.id)).toBe(true);
  });

  it("checkers and viewers may not upload (403), and nothing is stored", async () => {
    const before = await storedRows();
    for (const who of [checker, viewer]) {
      const res = await upload(who.key, { name: `By ${who.role}`, csv: GOOD });
      expect(res.status).toBe(403);
    }
    expect(await storedRows()).toBe(before);
  });

  it("a CSV with bad rows is refused with each row and column named; nothing is stored", async () => {
    const before = await storedRows();
    const res = await upload(admin.key, { name: "Broken stock", fileName: "broken.csv", csv: "id,family,area_mm2,I_mm4\nB1,tube,500\nB2,tube,600,0\nB1,tube,700,1e5\n" });
    expect(res.status).toBe(400);
    const body = (await res.json()) as { error: string; details: { path: string; message: string }[] };
    expect(body.details.map((d) => d.path)).toEqual(["broken.csv row 2 I_mm4", "broken.csv row 3 I_mm4", "broken.csv row 4 id"]);
    expect(body.details[1]!.message).toMatch(/must be greater than zero/);
    expect(await storedRows()).toBe(before);
  });

  it("a missing name, a missing file and a name in use are refused", async () => {
    expect((await upload(engineer.key, { csv: GOOD })).status).toBe(400);
    expect((await upload(engineer.key, { name: "No file" })).status).toBe(400);
    const clash = await upload(engineer.key, { name: "quarry YARD stock", csv: GOOD });
    expect(clash.status).toBe(409);
    expect(((await clash.json()) as { details: { path: string }[] }).details[0]!.path).toBe("name");
  });
});

describe("the built-in catalogue", () => {
  it("is listed first, generated from dimensions, and cannot be retired or have its name taken", async () => {
    const { listCatalogues, getCatalogue, retireCatalogue } = await import("~/lib/catalogues/catalogues.server");
    const [first] = await listCatalogues({}, database);
    expect(first).toMatchObject({ id: "built-in", builtIn: true, families: ["CHS", "SHS", "RND"] });
    const chs = (await getCatalogue("built-in", database))!.sections.find((s) => s.id === "CHS 88.9x4")!;
    // by hand (closed form): A = π/4 (88.9² − 80.9²) = π/4 · (7903.21 − 6544.81) = π/4 · 1358.4 = 1066.9 mm²;
    // I = π/64 (88.9⁴ − 80.9⁴) = π/64 · (62,460,728 − 42,834,538) = π/64 · 19,626,190 = 9.634e5 mm⁴
    expect(chs.area).toBeCloseTo(1066.88, 1);
    expect(chs.I / 9.634e5).toBeCloseTo(1, 3);
    expect(chs.dimensions).toEqual({ outer: 88.9, wall: 4 });
    expect(await retireCatalogue({ id: "built-in", user: admin.sessionUser }, database)).toMatchObject({ ok: false, status: 409 });
    expect((await upload(engineer.key, { name: "Strutwise generic sections", csv: GOOD })).status).toBe(409);
  });
});

describe("retiring", () => {
  it("viewers cannot retire; an engineer can, once; it then leaves the list but stays readable", async () => {
    const res = await upload(engineer.key, { name: "Old stock 2025", csv: GOOD });
    const { id } = (await res.json()) as { id: string };
    const retire = await import("~/routes/api/catalogues.$catalogueId.retire");
    const post = (key: string) =>
      call(retire.action, new Request(url(`/api/catalogues/${id}/retire`), { method: "POST", body: JSON.stringify({ reason: "superseded" }), headers: { ...auth(key), "content-type": "application/json" } }), { catalogueId: id });
    expect((await post(viewer.key)).status).toBe(403);
    expect((await post(checker.key)).status).toBe(403);
    const ok = await post(engineer.key);
    expect(ok.status).toBe(200);
    expect(await ok.json()).toMatchObject({ retireReason: "superseded", retiredBy: "Odile Marchbank" });
    expect((await post(admin.key)).status).toBe(409);

    const { listCatalogues, getCatalogue } = await import("~/lib/catalogues/catalogues.server");
    expect((await listCatalogues({}, database)).map((c) => c.id)).not.toContain(id);
    expect((await listCatalogues({ includeRetired: true }, database)).map((c) => c.id)).toContain(id);
    expect((await getCatalogue(id, database))?.sections).toHaveLength(3);
    // the name is free again for a new catalogue
    expect((await upload(engineer.key, { name: "Old stock 2025", csv: GOOD })).status).toBe(201);
  });

  it("an unknown catalogue is a 404", async () => {
    const retire = await import("~/routes/api/catalogues.$catalogueId.retire");
    const res = await call(retire.action, new Request(url("/api/catalogues/nope/retire"), { method: "POST", headers: auth(admin.key) }), { catalogueId: "nope" });
    expect(res.status).toBe(404);
  });
});

describe("a model takes its sections from a catalogue at upload", () => {
  async function uploadModel(fields: Record<string, string>, model: unknown = { ...twoBarModel(), units: { length: "m", force: "kN", mass: "t" } }) {
    const route = await import("~/routes/api/models");
    const form = new FormData();
    form.set("projectId", projectId);
    form.set("file", new Blob([JSON.stringify(model)], { type: "application/json" }), "frame.truss.json");
    for (const [k, v] of Object.entries(fields)) form.set(k, v);
    return call(route.action, new Request(url("/api/models"), { method: "POST", body: form, headers: auth(engineer.key) }));
  }

  it("copies the chosen family into the stored file, converted to the model's metres", async () => {
    const cat = (await (await upload(engineer.key, { name: "Pier stock", csv: GOOD })).json()) as { id: string };
    const res = await uploadModel({ catalogueId: cat.id, catalogueFamilies: "tube" });
    expect(res.status).toBe(201);
    const body = (await res.json()) as { id: string; catalogue: { name: string; sectionCount: number } };
    expect(body.catalogue).toMatchObject({ name: "Pier stock", sectionCount: 2 });
    const { getModelFile } = await import("~/lib/models.server");
    const file = JSON.parse((await getModelFile(body.id, database))!.text) as { sections: { id: string; area: number; I: number; family: string }[] };
    expect(file.sections.map((s) => s.id)).toEqual(["T 60x3", "T 76x4"]);
    expect(file.sections[0]!.area).toBeCloseTo(537.2e-6, 15); // mm² → m²
    expect(file.sections[0]!.I).toBeCloseTo(218780e-12, 20); // mm⁴ → m⁴
  });

  it("takes one family of the built-in catalogue", async () => {
    const res = await uploadModel({ catalogueId: "built-in", catalogueFamilies: "RND" }, { ...twoBarModel(), units: { length: "mm", force: "N", mass: "t" } });
    expect(res.status).toBe(201);
    const body = (await res.json()) as { catalogue: { sectionCount: number } };
    expect(body.catalogue.sectionCount).toBe(10); // ten common bar diameters, 10 to 60 mm
  });

  it("refuses an unknown or retired catalogue and an unknown family, storing no model", async () => {
    const { models } = await import("~/db/schema");
    const before = (await database.select({ n: count() }).from(models))[0]!.n;
    expect((await uploadModel({ catalogueId: "no-such-catalogue" })).status).toBe(400);
    const cat = (await (await upload(engineer.key, { name: "Retired pier stock", csv: GOOD })).json()) as { id: string };
    expect((await uploadModel({ catalogueId: cat.id, catalogueFamilies: "angle" })).status).toBe(400);
    const { retireCatalogue } = await import("~/lib/catalogues/catalogues.server");
    await retireCatalogue({ id: cat.id, user: engineer.sessionUser }, database);
    const res = await uploadModel({ catalogueId: cat.id });
    expect(res.status).toBe(400);
    expect(((await res.json()) as { error: string }).error).toMatch(/is retired/);
    expect((await database.select({ n: count() }).from(models))[0]!.n).toBe(before);
  });
});

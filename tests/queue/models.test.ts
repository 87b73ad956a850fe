// storeModel: the upload gate. Good files are stored (bucket + row, sha256 as coreutils
// computes it); bad JSON, invalid models, mechanisms and oversize files are refused with the
// offending item named, and nothing at all is stored for them.
import { ListObjectsV2Command } from "@aws-sdk/client-s3";
import { execFileSync, spawnSync } from "node:child_process";
import fs from "node:fs";
import path from "node:path";
import { count } from "drizzle-orm";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import type { Db } from "~/db/client.server";
import type { TestServices } from "../support/services";
import { gridModel, mechanismModel, twoBarModel } from "./support/models";
import { makeProject, setupQueue } from "./support/setup";

const LIMIT = 40_000;
let services: TestServices;
let database: Db;
let projectId: string;

beforeAll(async () => {
  ({ services, db: database } = await setupQueue({ UPLOAD_LIMIT_BYTES: String(LIMIT) }));
  projectId = await makeProject();
});
afterAll(async () => services?.stop());

const bytes = (v: unknown) => new TextEncoder().encode(typeof v === "string" ? v : JSON.stringify(v, null, 2));

async function stored() {
  const { models } = await import("~/db/schema");
  const { s3 } = await import("~/lib/storage.server");
  const [row] = await database.select({ n: count() }).from(models);
  const listed = await s3().send(new ListObjectsV2Command({ Bucket: services.env.S3_BUCKET, Prefix: "models/" }));
  return { rows: row!.n, objects: listed.KeyCount ?? 0 };
}

async function store(content: Uint8Array, fileName = "upload.truss.json") {
  const { storeModel } = await import("~/lib/models.server");
  return storeModel({ projectId, fileName, bytes: content, user: null }, database);
}

describe("storeModel", () => {
  it("stores a valid model: the file byte for byte, the row with the engine's summary, sha256 as sha256sum gives it", async () => {
    const { getModel, getModelFile } = await import("~/lib/models.server");
    const content = bytes(twoBarModel());
    const r = await store(content, "two-bar.truss.json");
    if (!r.ok) throw new Error(r.error);
    const file = path.join(services.dir, "two-bar.truss.json");
    fs.writeFileSync(file, content);
    // outside reference: GNU coreutils
    expect(r.model.sha256).toBe(execFileSync("sha256sum", [file], { encoding: "utf8" }).split(" ")[0]);
    expect(r.model).toMatchObject({ name: "Queue probe: two-bar frame", nodeCount: 3, memberCount: 2, dimension: 2, hasDesign: true });
    expect((r.model.summary as { stability: { ok: boolean } }).stability.ok).toBe(true);
    expect((await getModel(r.model.id, database))?.sha256).toBe(r.model.sha256);
    expect((await getModelFile(r.model.id, database))?.text).toBe(new TextDecoder().decode(content));
  });

  it("names line and column of a JSON syntax error as Python's json module does, and stores nothing", async () => {
    const before = await stored();
    const cases = [
      '{\n  "format": "strutwise.truss",\n  "version" 1\n}', // missing colon
      '{"nodes": [1, 2,], "x": 1}', // a value missing after the comma
      '{\n  "a": 1,\n}', // trailing comma in an object
      '{"a": 1 "b": 2}', // missing comma
      '{"a": tru}', // bad literal
      '{"a": 1}\n\n  x', // text after the document
    ];
    // outside reference: CPython's json decoder (standard library)
    const py = spawnSync(
      "python3",
      ["-c", "import json,sys\nfor t in json.load(sys.stdin):\n  try: json.loads(t); print('ok')\n  except json.JSONDecodeError as e: print(e.lineno, e.colno)"],
      { input: JSON.stringify(cases), encoding: "utf8" },
    );
    if (py.status !== 0) {
      console.warn(`!!! python3 is not usable (${py.stderr || py.error}); JSON positions are checked against the hand-counted values only`);
    }
    const expected = py.status === 0 ? py.stdout.trim().split("\n") : ["3 13", "1 17", "3 1", "1 9", "1 7", "3 3"];
    for (let i = 0; i < cases.length; i++) {
      const r = await store(bytes(cases[i]!));
      expect(r.ok).toBe(false);
      if (r.ok) continue;
      expect(r.status).toBe(400);
      const [line, col] = expected[i]!.split(" ");
      expect(r.error, cases[i]).toContain(`at line ${line}, column ${col}`);
      expect(r.details[0]!.path).toBe(`(file) line ${line}, column ${col}`);
    }
    expect(await stored()).toEqual(before);
  });

  it("refuses an invalid model with every problem named by its path, and stores nothing", async () => {
    const before = await stored();
    const text = fs.readFileSync(path.resolve("tests/fixtures/models/analysis/broken-references.truss.json"));
    const r = await store(new Uint8Array(text));
    expect(r.ok).toBe(false);
    if (r.ok) return;
    expect(r.status).toBe(400);
    const paths = r.details.map((d) => d.path);
    expect(paths.some((p) => p.startsWith("members[1]"))).toBe(true); // end node X does not exist
    expect(paths.some((p) => p.startsWith("members[2]"))).toBe(true); // material timber, area 0
    expect(r.error).toMatch(/^The model in upload.truss.json has \d+ problems/);
    expect(await stored()).toEqual(before);
  });

  it("refuses a mechanism at upload with the engine's message naming node and direction", async () => {
    const before = await stored();
    const r = await store(bytes(mechanismModel()));
    expect(r.ok).toBe(false);
    if (r.ok) return;
    expect(r.status).toBe(400);
    expect(r.details).toContainEqual({ path: "nodes[2]", message: expect.stringContaining("node C can move freely") });
    expect(await stored()).toEqual(before);
  });

  it("refuses a file over the upload limit with 413, and stores nothing", async () => {
    const before = await stored();
    const big = bytes(gridModel(30, 4));
    expect(big.byteLength).toBeGreaterThan(LIMIT);
    const r = await store(big, "big-grid.truss.json");
    expect(r).toMatchObject({ ok: false, status: 413 });
    if (!r.ok) expect(r.error).toMatch(/^The file big-grid.truss.json is 0\.\d\d MB, larger than the upload limit of 0\.04 MB/);
    expect(await stored()).toEqual(before);
  });

  it("refuses non-UTF-8 bytes, an empty file and an unknown project", async () => {
    const { storeModel } = await import("~/lib/models.server");
    expect(await store(new Uint8Array([0x7b, 0xff, 0xfe, 0x7d]))).toMatchObject({ ok: false, status: 400, error: expect.stringContaining("not UTF-8") });
    expect(await store(new Uint8Array())).toMatchObject({ ok: false, status: 400, error: expect.stringContaining("empty") });
    const r = await storeModel({ projectId: "no-such-project", fileName: "x.json", bytes: bytes(twoBarModel()), user: null }, database);
    expect(r).toMatchObject({ ok: false, status: 404 });
  });
});

// The JSON Schema of the model: the committed docs/model.schema.json is what the zod schema
// generates today (run `npm run schema` after a schema change), the route serves it, and an
// outside validator (Python's jsonschema, Draft 2020-12, Debian python3-jsonschema) accepts
// every fixture model the engine accepts and refuses files with shape errors.
import { spawnSync } from "node:child_process";
import fs from "node:fs";
import path from "node:path";
import { describe, expect, it } from "vitest";
import { parseModel } from "~/engine/truss";
import { modelJsonSchemaText } from "~/engine/truss/json-schema";
import { loudSkip } from "../support/scipy";

const committed = path.resolve("docs/model.schema.json");

describe("model JSON Schema", () => {
  it("the committed file is fresh (npm run schema rewrites it)", () => {
    expect(fs.readFileSync(committed, "utf8")).toBe(modelJsonSchemaText());
  });

  it("GET /api/schema/model.json serves the same text", async () => {
    const route = await import("~/routes/api/schema.model");
    const res = await route.loader();
    expect(res.headers.get("content-type")).toMatch(/schema\+json/);
    expect(await res.text()).toBe(fs.readFileSync(committed, "utf8"));
  });

  it("Python's jsonschema agrees with the engine on the fixture models", () => {
    const probe = spawnSync("python3", ["-c", "import jsonschema"], { encoding: "utf8" });
    if (probe.status !== 0) return loudSkip("JSON Schema cross-check: no python3 with jsonschema (Debian python3-jsonschema)");
    const dir = path.resolve("tests/fixtures/models");
    const files = fs.readdirSync(dir, { recursive: true, encoding: "utf8" }).filter((f) => f.endsWith(".truss.json"));
    const good: string[] = [];
    for (const f of files) {
      let json: unknown;
      try {
        json = JSON.parse(fs.readFileSync(path.join(dir, f), "utf8"));
      } catch {
        continue; // a syntax error is not the schema's business
      }
      if (parseModel(json).ok) good.push(path.join(dir, f));
    }
    expect(good.length).toBeGreaterThan(3);
    const script = `
import json, sys, jsonschema
schema = json.load(open(sys.argv[1]))
jsonschema.Draft202012Validator.check_schema(schema)
v = jsonschema.Draft202012Validator(schema)
out = {}
for f in sys.argv[2:]:
    out[f] = [e.message for e in v.iter_errors(json.load(open(f)))]
bad = {"format": "strutwise.truss", "version": 2, "name": "", "units": {"length": "furlong", "force": "N", "mass": "t"}, "dimension": 4, "materials": [], "nodes": [], "members": [], "loadCases": []}
out["(bad)"] = [e.message for e in v.iter_errors(bad)]
print(json.dumps(out))
`;
    const r = spawnSync("python3", ["-c", script, committed, ...good], { encoding: "utf8" });
    expect(r.status, r.stderr).toBe(0);
    const out = JSON.parse(r.stdout) as Record<string, string[]>;
    for (const f of good) expect(out[f], f).toEqual([]);
    expect(out["(bad)"]!.length).toBeGreaterThanOrEqual(5);
  });
});

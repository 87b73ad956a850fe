// The demo models shipped for the seeded app must validate and solve to a verified optimum.
import fs from "node:fs";
import path from "node:path";
import { describe, expect, it } from "vitest";
import { parseModel } from "~/engine/truss";
import { optimizeModel } from "~/engine/design";

const dir = path.resolve(import.meta.dirname, "../../../demo/models");
const files = fs.readdirSync(dir).filter((f) => f.endsWith(".truss.json"));

describe("demo models", () => {
  it("cover 2D, 3D and shape variables", () => {
    const models = files.map((f) => JSON.parse(fs.readFileSync(path.join(dir, f), "utf8")));
    expect(models.some((m) => m.dimension === 2)).toBe(true);
    expect(models.some((m) => m.dimension === 3)).toBe(true);
    expect(models.some((m) => (m.design?.shape ?? []).length > 0)).toBe(true);
  });
  for (const f of files) {
    it(`${f} solves to a verified optimum`, () => {
      const parsed = parseModel(JSON.parse(fs.readFileSync(path.join(dir, f), "utf8")));
      expect(parsed.ok).toBe(true);
      if (!parsed.ok) return;
      const r = optimizeModel(parsed.model);
      expect(r.status).toBe("optimal");
      expect(r.verification!.allLimitsMet).toBe(true);
      expect(r.objective.final).toBeLessThan(r.objective.initial);
      expect(r.shadowPrices!.filter((s) => s.sentence).length).toBeGreaterThan(0);
    });
  }
});

// The editor's tables and design form hold a model without changing it: every stored example
// opens and saves unchanged, a form edit reaches the file as the format says, and a bad field
// gets the very message an upload of the same file gets (the engine's parser gives both).
// The span / 250 deflection default is common practice (docs/model-format.md says so too).
import fs from "node:fs";
import path from "node:path";
import { describe, expect, it } from "vitest";
import { fromTables, toTables } from "~/components/editor/model-rows";
import { DEFAULT_DEFLECTION_RATIO, fromDesignFields, limitForRatio, parseMoves, ratioOfLimit, referenceLength, startingDesign, toDesignFields } from "~/components/editor/design-fields";
import { generateModel } from "~/engine/generators";
import { parseModel } from "~/engine/truss";

type Obj = Record<string, any>; // eslint-disable-line @typescript-eslint/no-explicit-any

const root = path.resolve(__dirname, "../..");
const files = ["demo/models", "tests/fixtures/models/design", "tests/fixtures/models/analysis"].flatMap((dir) =>
  fs
    .readdirSync(path.join(root, dir))
    .filter((f) => f.endsWith(".truss.json") && !f.startsWith("broken-json"))
    .map((f) => path.join(dir, f)),
);

function generated(kind: string, params: Obj = {}): Obj {
  const r = generateModel(kind, params);
  if (!r?.ok) throw new Error(`generator ${kind} refused its parameters`);
  return r.model as Obj;
}

describe("editor tables", () => {
  it.each(files)("%s opens and saves unchanged", (file) => {
    const model = JSON.parse(fs.readFileSync(path.join(root, file), "utf8")) as Obj;
    expect(fromTables(toTables(model))).toEqual(model);
  });

  it.each(["planar-truss", "lattice-tower", "space-grid"])("a generated %s opens and saves unchanged", (kind) => {
    const model = generated(kind);
    expect(fromTables(toTables(model))).toEqual(model);
  });
});

describe("design form", () => {
  it("writes each field where the format puts it", () => {
    const model = generated("planar-truss", { span: 12, panels: 6 });
    const t = toTables(model);
    t.design = { ...t.design, objective: "compliance", formulation: "simultaneous", stress: false, volumeOn: true, volumeMax: "4e7", bucklingOn: true, sectionRatio: "0.8", effectiveLengthFactor: "0.9", maxIterations: "300", tolerance: "1e-7" };
    t.design.shape = [{ id: "rise", min: "-500", max: "1500", moves: "T3 y 1; T4 y 0.5" }];
    const d = fromTables(t).design as Obj;
    expect(d.objective).toBe("compliance");
    expect(d.formulation).toBe("simultaneous");
    expect(d.constraints).toEqual({ stress: false, displacement: model.design.constraints.displacement, volume: { max: 4e7 }, buckling: { sectionRatio: 0.8, effectiveLengthFactor: 0.9 } });
    expect(d.shape).toEqual([{ id: "rise", min: -500, max: 1500, moves: [{ node: "T3", axis: "y", factor: 1 }, { node: "T4", axis: "y", factor: 0.5 }] }]);
    expect(d.solver).toEqual({ maxIterations: 300, tolerance: 1e-7 });
    expect(d.groups).toEqual(model.design.groups);
  });

  it("reads shape moves as typed; a factor left out is the format's default", () => {
    expect(parseMoves("A y; B x -0.5\nC z 2")).toEqual([{ node: "A", axis: "y" }, { node: "B", axis: "x", factor: -0.5 }, { node: "C", axis: "z", factor: 2 }]);
  });

  it("turning the design off leaves an analysis-only model; turning it on proposes stress and span / 250", () => {
    const model = generated("planar-truss", { span: 12, panels: 6 });
    const t = toTables(model);
    t.design = { ...t.design, enabled: false };
    const bare = fromTables(t);
    expect(bare.design).toBeUndefined();
    expect(parseModel(bare).ok).toBe(true);
    const fresh = toTables(bare);
    fresh.design = startingDesign(bare as never, fresh.design);
    const d = fromTables(fresh).design as Obj;
    // 12 m span / 250 = 48 mm (common practice for service deflection, not a code rule);
    // area bounds 1/40 to 10 times the 2,000 mm² starting area, as the generators propose
    expect(d).toEqual({ objective: "mass", areaBounds: { min: 50, max: 20000 }, constraints: { stress: true, displacement: [{ node: "*", axis: "y", limit: 48 }] } });
    expect(parseModel(fromTables(fresh)).ok).toBe(true);
  });

  it("names a deflection limit as span / ratio: the girder's span, the tower's height", () => {
    const girder = generated("planar-truss", { span: 12, panels: 6 });
    const gl = girder.design.constraints.displacement[0];
    const span = referenceLength(girder.nodes, gl.axis, "y");
    expect(span).toEqual({ length: 12000, basis: "span" });
    expect(ratioOfLimit(span.length, String(gl.limit))).toBeCloseTo(DEFAULT_DEFLECTION_RATIO, 6);
    expect(limitForRatio(12000, 360)).toBe("33.3");

    const tower = generated("lattice-tower");
    const tl = tower.design.constraints.displacement[0];
    const height = referenceLength(tower.nodes, tl.axis, "z");
    expect(height.basis).toBe("height");
    expect(height.length).toBe(Math.max(...tower.nodes.map((n: Obj) => n.z)) - Math.min(...tower.nodes.map((n: Obj) => n.z)));
    expect(ratioOfLimit(height.length, String(tl.limit))).toBeCloseTo(DEFAULT_DEFLECTION_RATIO, 1);
  });

  it("a bad field gets the same message an upload of the same file gets", () => {
    const model = generated("planar-truss", { span: 12, panels: 6 });
    const t = toTables(model);
    t.design = { ...t.design, displacement: [{ node: "nowhere", axis: "sideways", limit: "-3" }], volumeOn: true, volumeMax: "", areaMin: "abc" };
    const fromForm = parseModel(fromTables(t));
    const edited = structuredClone(model);
    edited.design.constraints.displacement = [{ node: "nowhere", axis: "sideways", limit: -3 }];
    edited.design.constraints.volume = {};
    edited.design.areaBounds.min = "abc";
    const fromUpload = parseModel(JSON.parse(JSON.stringify(edited)));
    expect(fromForm.ok).toBe(false);
    if (fromForm.ok || fromUpload.ok) return;
    const paths = fromForm.errors.map((e) => e.path);
    expect(paths).toEqual(expect.arrayContaining(["design.constraints.displacement[0].node", "design.constraints.displacement[0].axis", "design.constraints.displacement[0].limit", "design.constraints.volume.max", "design.areaBounds.min"]));
    expect(fromForm.errors).toEqual(fromUpload.errors);
  });

  it("keeps fields the form does not show", () => {
    const design = { objective: "mass", futureKnob: 3, constraints: { stress: true, futureLimit: { a: 1 } } };
    expect(fromDesignFields(toDesignFields(design), [], design)).toEqual(design);
  });
});

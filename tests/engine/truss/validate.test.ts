// Every rule of docs/model-format.md ("Rules that bad input must meet") with the message it gives.
import { describe, expect, it } from "vitest";
import { rejections } from "../../support/model-rejections";
import { parseModel, parseModelText } from "~/engine/truss";

const base = () => ({
  format: "strutwise.truss",
  version: 1,
  name: "Kettering Yard footbridge, option C (invented)",
  units: { length: "mm", force: "N", mass: "t" },
  dimension: 2,
  materials: [{ id: "steel", E: 210000, density: 7.85e-9, allowableTension: 235, allowableCompression: 235 }],
  nodes: [
    { id: "A", x: 0, y: 0, fixed: ["x", "y"] },
    { id: "B", x: 4000, y: 0, fixed: ["y"] },
    { id: "C", x: 2000, y: 1500 },
  ] as Record<string, unknown>[],
  members: [
    { id: "AB", start: "A", end: "B", material: "steel", area: 1000, group: "chord" },
    { id: "BC", start: "B", end: "C", material: "steel", area: 800 },
    { id: "CA", start: "C", end: "A", material: "steel", area: 800 },
  ] as Record<string, unknown>[],
  loadCases: [{ id: "LC1", name: "Service", loads: [{ node: "C", fy: -20000 }] }] as Record<string, unknown>[],
  design: {
    objective: "mass",
    areaBounds: { min: 10, max: 20000 },
    groups: [{ id: "chord", min: 100, max: 8000 }],
    constraints: { stress: true },
  } as Record<string, unknown>,
});

type M = ReturnType<typeof base>;
const { errorsOf, expectError } = rejections(base);

describe("parseModel accepts a valid model", () => {
  it("with summary and no warnings", () => {
    const r = parseModel(base());
    expect(r.ok).toBe(true);
    if (!r.ok) return;
    expect(r.warnings).toEqual([]);
    expect(r.summary.counts).toMatchObject({ nodes: 3, members: 3, materials: 1, loadCases: 1, groups: 1, restrainedDofs: 3, freeDofs: 3 });
    expect(r.summary.totalLength).toBeCloseTo(4000 + 2 * 2500, 9);
    expect(r.summary.initialVolume).toBeCloseTo(1000 * 4000 + 2 * 800 * 2500, 6);
    expect(r.summary.design).toMatchObject({ objective: "mass", formulation: "nested", areaVariables: 3, shapeVariables: 0, constraints: ["stress"] });
    expect(r.summary.stability.ok).toBe(true);
  });
});

describe("every rule names the item and what is wrong (docs/model-format.md)", () => {
  it("format, version, name", () => {
    expectError((m) => (m.format = "other"), "format", /exactly "strutwise.truss"/);
    expectError((m) => ((m as { version: number }).version = 2), "version", /version must be 1/);
    expectError((m) => (m.name = ""), "name", /name must not be empty/);
    expectError((m) => (m.name = "x".repeat(201)), "name", /at most 200/);
  });
  it("units and dimension", () => {
    expectError((m) => ((m.units as Record<string, string>).length = "yd"), "units.length", /m, cm, mm, ft, in/);
    expectError((m) => ((m as { dimension: number }).dimension = 4), "dimension", /2 or 3/);
  });
  it("duplicate ids", () => {
    expectError((m) => m.nodes.push({ id: "A", x: 1, y: 1 }), "nodes[3].id", /node A: duplicate node id "A" \(also used by nodes\[0\]\)/);
    expectError((m) => m.members.push({ ...m.members[0] }), "members[3].id", /member AB: duplicate member id/);
    expectError((m) => m.materials.push({ ...m.materials[0] }), "materials[1].id", /duplicate material id "steel"/);
    expectError((m) => m.loadCases.push({ ...m.loadCases[0] }), "loadCases[1].id", /duplicate load case id "LC1"/);
  });
  it("unknown nodes and materials", () => {
    expectError((m) => (m.members[1].end = "Q"), "members[1].end", /member BC: ends at unknown node "Q"/);
    expectError((m) => (m.members[1].start = "Q"), "members[1].start", /member BC: starts at unknown node "Q"/);
    expectError((m) => (m.members[2].material = "oak"), "members[2].material", /member CA: uses material "oak", which is not defined/);
  });
  it("same node at both ends, zero length", () => {
    expectError((m) => (m.members[1].end = "B"), "members[1].end", /starts and ends at the same node "B"/);
    expectError((m) => m.nodes.push({ id: "D", x: 0, y: 0 }) && m.members.push({ id: "AD", start: "A", end: "D", material: "steel", area: 5 }), "members[3]", /member AD: has zero length: nodes "A" and "D" are at the same position/);
  });
  it("non-positive E and area, negative density", () => {
    expectError((m) => (m.materials[0].E = 0), "materials[0].E", /material steel: E \(elastic modulus\) must be greater than zero \(got 0\)/);
    expectError((m) => (m.members[0].area = -5), "members[0].area", /member AB: area must be greater than zero \(got -5\)/);
    expectError((m) => (m.materials[0].density = -1), "materials[0].density", /density must not be negative/);
  });
  it("bounds with min > max", () => {
    expectError((m) => ((m.design as { areaBounds: object }).areaBounds = { min: 50, max: 10 }), "design.areaBounds", /min \(50\) is greater than max \(10\)/);
    expectError((m) => ((m.design as { groups: object[] }).groups = [{ id: "chord", min: 900, max: 100 }]), "design.groups[0]", /design group chord: min \(900\) is greater than max \(100\)/);
    expectError((m) => ((m.design as { areaBounds: object }).areaBounds = { min: 0, max: 10 }), "design.areaBounds.min", /greater than zero/);
  });
  it("loads on unknown nodes", () => {
    expectError((m) => ((m.loadCases[0].loads as object[]).push({ node: "Z", fx: 1 })), "loadCases[0].loads[1].node", /load #2 of load case LC1: acts on unknown node "Z"/);
  });
  it("a mechanism names the node and direction", () => {
    expectError((m) => (m.nodes[0].fixed = ["y"]), "nodes[0]", /not supported in x/);
    expectError((m) => m.members.splice(2, 1), "nodes[2]", /node C can move freely/);
  });
  it("a design block that leaves nothing to optimize", () => {
    expectError((m) => {
      m.members.forEach((x) => (x.group = "chord"));
      (m.design as { groups: object[] }).groups = [{ id: "chord", min: 500, max: 500 }];
    }, "design", /leaves nothing to optimize/);
  });
  it("unknown group in design.groups, missing areaBounds, undeclared group is fine", () => {
    expectError((m) => ((m.design as { groups: object[] }).groups.push({ id: "web" })), "design.groups[1].id", /no member belongs to group "web"/);
    expectError((m) => delete (m.design as { areaBounds?: object }).areaBounds, "design.areaBounds", /required: members BC, CA have no declared group bounds/);
    const m = base();
    m.members[1].group = "web"; // referenced, not declared: uses areaBounds
    expect(parseModel(m).ok).toBe(true);
  });
  it("non-finite numbers", () => {
    expectError((m) => (m.nodes[2].x = Infinity), "nodes[2].x", /node C: x is Infinity; numbers must be finite/);
    expectError((m) => (m.nodes[2].y = NaN), "nodes[2].y", /node C: y is NaN; numbers must be finite/);
    expectError((m) => (m.nodes[2].y = "12"), "nodes[2].y", /y must be a finite number/);
  });
  it("missing fields are named", () => {
    expectError((m) => delete m.members[0].area, "members[0].area", /member AB: "area" is missing/);
  });
  it("stress constraint needs allowables; shape and displacement references", () => {
    expectError((m) => delete (m.materials[0] as Record<string, unknown>).allowableTension, "materials[0]", /allowableTension and allowableCompression are both needed/);
    expectError((m) => ((m.design as Record<string, unknown>).shape = [{ id: "rise", min: -1, max: 1, moves: [{ node: "Q", axis: "y" }] }]), "design.shape[0].moves[0].node", /move #1 of shape variable rise: moves unknown node "Q"/);
    expectError((m) => ((m.design as Record<string, unknown>).shape = [{ id: "rise", min: -1, max: 1, moves: [{ node: "C", axis: "z" }] }]), "design.shape[0].moves[0].axis", /model is 2D/);
    expectError((m) => ((m.design as Record<string, unknown>).constraints = { displacement: [{ node: "Q", axis: "y", limit: 5 }] }), "design.constraints.displacement[0].node", /unknown node "Q"/);
  });
  it("collects many errors, capped, the last entry saying how many more", () => {
    const errs = errorsOf((m) => m.members.forEach((x) => ((x.material = "none"), (x.end = "Q"))));
    expect(errs.length).toBeGreaterThanOrEqual(6);
    const m = base();
    for (let i = 0; i < 80; i++) m.members.push({ id: `X${i}`, start: "A", end: `nowhere${i}`, material: "steel", area: 1 });
    const r = parseModel(m, { maxErrors: 10 });
    expect(r.ok).toBe(false);
    if (r.ok) return;
    expect(r.errors).toHaveLength(10);
    expect(r.errors[9].message).toMatch(/71 more errors not listed/);
  });
  it("file text: JSON syntax errors and the upload limit", () => {
    const bad = parseModelText("{ \"format\": ");
    expect(bad.ok).toBe(false);
    if (!bad.ok) expect(bad.errors[0].message).toMatch(/not valid JSON/);
    const big = parseModelText(JSON.stringify(base()), { maxBytes: 100 });
    expect(!big.ok && big.errors[0].message).toMatch(/over the upload limit of 100 bytes/);
    expect(parseModel([1, 2]).ok).toBe(false);
  });
});

describe("warnings for suspicious but legal input", () => {
  const warningsOf = (edit: (m: M) => void) => {
    const m = base();
    edit(m);
    const r = parseModel(m);
    expect(r.ok, JSON.stringify(!r.ok && r.errors)).toBe(true);
    return r.warnings;
  };
  it("isolated node, load on a supported direction, empty load case, unknown field", () => {
    const w = warningsOf((m) => {
      m.nodes.push({ id: "Z", x: 9000, y: 9000 });
      (m.loadCases[0].loads as object[]).push({ node: "A", fy: -10 });
      m.loadCases.push({ id: "LC2", loads: [] });
      m.members[0].colour = "red";
    });
    const text = w.map((x) => `${x.path} ${x.message}`).join("\n");
    expect(text).toMatch(/nodes\[3\] node Z: no member connects this node/);
    expect(text).toMatch(/loadCases\[0\]\.loads\[1\]\.fy .*supported direction/);
    expect(text).toMatch(/load case LC2: has no non-zero loads/);
    expect(text).toMatch(/members\[0\]\.colour member AB: unknown field "colour" is ignored/);
  });
  it("very slender member, starting area outside its bounds, duplicate member", () => {
    const w = warningsOf((m) => {
      m.members[1].area = 0.01; // L / sqrt(A) = 25000
      m.members[0].area = 50; // below the chord group's min 100
      m.members.push({ id: "AB2", start: "B", end: "A", material: "steel", area: 1000 });
    });
    const text = w.map((x) => x.message).join("\n");
    expect(text).toMatch(/member BC: is very slender/);
    expect(text).toMatch(/member AB: starting area 50 is outside its bounds \[100, 8000\]/);
    expect(text).toMatch(/member AB2: joins the same two nodes as member AB/);
  });
  it("minimum mass without limits", () => {
    const w = warningsOf((m) => ((m.design as Record<string, unknown>).constraints = {}));
    expect(w.some((x) => /every area at its lower bound/.test(x.message))).toBe(true);
  });
});

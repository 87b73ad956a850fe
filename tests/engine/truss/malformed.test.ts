// The malformed-model set: sixty files the upload gate must refuse with a 400 that names the
// problem and where it is (item and field, or line and column), never a 500 and never a
// stored model. Each case breaks one thing in the two-bar frame of tests/queue/support.
import { describe, expect, it } from "vitest";
import { checkModelBytes } from "~/lib/models/model-gate";
import { twoBarModel } from "../../queue/support/models";

type M = Record<string, any>; // eslint-disable-line @typescript-eslint/no-explicit-any
const LIMIT = 5 * 1024 * 1024;
const enc = (s: string) => new TextEncoder().encode(s);
const base = () => JSON.parse(JSON.stringify(twoBarModel("Malformed probe"))) as M;
const edit = (f: (m: M) => void) => {
  const m = base();
  f(m);
  return JSON.stringify(m);
};

/** [what is broken, the file text, text the refusal must contain (path or message)] */
const CASES: [string, string, string][] = [
  // syntax and shape of the file
  ["empty file", "", "empty"],
  ["not JSON at all", "hello", "not valid JSON"],
  ["truncated document", JSON.stringify(base()).slice(0, 60), "not valid JSON"],
  ["a bare array", "[1,2,3]", "one JSON object"],
  ["a bare number", "42", "one JSON object"],
  ["null", "null", "one JSON object"],
  ["nested a thousand levels deep", `{"a":${"[".repeat(1000)}${"]".repeat(1000)}}`, "nests more than 64 levels deep (line 1, column"],
  ["deep nesting over several lines", `{\n "x":\n ${"{\"a\":".repeat(80)}1${"}".repeat(80)}\n}`, "(line 3, column"],
  ["invalid UTF-8", "", "not UTF-8"],
  ["number overflowing to Infinity", edit((m) => (m.nodes[2].y = 0)).replace('"y":0', '"y":1e400'), "finite"],
  // missing and mistyped fields
  ["no nodes", edit((m) => delete m.nodes), "nodes"],
  ["no members", edit((m) => delete m.members), "members"],
  ["no materials", edit((m) => delete m.materials), "materials"],
  ["no units", edit((m) => delete m.units), "units"],
  ["unknown length unit", edit((m) => (m.units.length = "furlong")), "length unit must be one of"],
  ["unknown force unit", edit((m) => (m.units.force = "dyn")), "force unit must be one of"],
  ["dimension 4", edit((m) => (m.dimension = 4)), "dimension"],
  ["node x as text", edit((m) => (m.nodes[0].x = "zero")), "nodes[0].x"],
  ["node without id", edit((m) => delete m.nodes[1].id), "nodes[1]"],
  ["fixed axis w", edit((m) => (m.nodes[0].fixed = ["x", "w"])), "fixed axes must be x, y or z"],
  ["member area zero", edit((m) => (m.members[0].area = 0)), "members[0].area"],
  ["member area negative", edit((m) => (m.members[1].area = -5)), "members[1].area"],
  ["member area as text", edit((m) => (m.members[0].area = "big")), "members[0].area"],
  ["E zero", edit((m) => (m.materials[0].E = 0)), "materials[0].E"],
  ["E negative", edit((m) => (m.materials[0].E = -210000)), "materials[0].E"],
  ["density negative", edit((m) => (m.materials[0].density = -1)), "materials[0].density"],
  ["load on a missing node", edit((m) => (m.loadCases[0].loads[0].node = "Z")), "loadCases[0].loads[0]"],
  ["load fx as text", edit((m) => (m.loadCases[0].loads[0].fx = "a lot")), "loadCases[0].loads[0].fx"],
  ["loads not a list", edit((m) => (m.loadCases[0].loads = {})), "loads must be a list"],
  // references
  ["member to a missing node", edit((m) => (m.members[0].end = "X")), "members[0]"],
  ["member with a missing material", edit((m) => (m.members[1].material = "oak")), "members[1]"],
  ["member from a node to itself", edit((m) => (m.members[0].end = "A")), "members[0]"],
  ["duplicate node id", edit((m) => (m.nodes[2].id = "A")), "duplicate node id"],
  ["duplicate member id", edit((m) => (m.members[1].id = "AC")), "duplicate member id"],
  ["duplicate load case id", edit((m) => m.loadCases.push({ ...m.loadCases[0] })), "duplicate load case id"],
  ["a mechanism: one of the two bars gone", edit((m) => m.members.pop()), "can move freely"],
  // design block
  ["area bounds reversed", edit((m) => (m.design.areaBounds = { min: 500, max: 10 })), "areaBounds"],
  ["area bound zero", edit((m) => (m.design.areaBounds.min = 0)), "design.areaBounds.min"],
  ["unknown objective", edit((m) => (m.design.objective = "beauty")), "design.objective"],
  ["unknown formulation", edit((m) => (m.design.formulation = "guess")), "design.formulation"],
  ["maxIterations fractional", edit((m) => (m.design.solver.maxIterations = 2.5)), "maxIterations must be a whole number"],
  ["tolerance zero", edit((m) => (m.design.solver.tolerance = 0)), "design.solver.tolerance"],
  ["displacement limit on a missing node", edit((m) => (m.design.constraints.displacement = [{ node: "Q", axis: "y", limit: 10 }])), "design.constraints.displacement[0]"],
  ["displacement limit zero", edit((m) => (m.design.constraints.displacement = [{ node: "C", axis: "y", limit: 0 }])), "design.constraints.displacement[0].limit"],
  ["volume cap negative", edit((m) => (m.design.constraints.volume = { max: -1 })), "design.constraints.volume.max"],
  // absurd magnitudes (engine/truss/magnitudes.ts), each named by its item
  ["node at y = -1e300", edit((m) => (m.nodes[2].y = -1e300)), 'node "C": y is -1e+300, outside the sane range for a coordinate'],
  ["node at x = 1e9", edit((m) => (m.nodes[1].x = 1e9)), 'node "B": x is 1e+9'],
  ["node at z = 5e20", edit((m) => (m.nodes[2].z = 5e20)), 'node "C": z'],
  ["load of 1e15", edit((m) => (m.loadCases[0].loads[0].fy = -1e15)), 'load case "LC1", load 1 on node "C": fy is -1e+15'],
  ["load of 1e200", edit((m) => (m.loadCases[0].loads[0].fx = 1e200)), "outside the sane range for a load component"],
  ["E of 1e40", edit((m) => (m.materials[0].E = 1e40)), 'material "steel": E is 1e+40, outside the sane range for an elastic modulus'],
  ["E of 1e-9", edit((m) => (m.materials[0].E = 1e-9)), 'material "steel": E is 1e-9'],
  ["density of 1e9", edit((m) => (m.materials[0].density = 1e9)), 'material "steel": density'],
  ["allowable stress of 1e30", edit((m) => (m.materials[0].allowableTension = 1e30)), 'material "steel": allowableTension'],
  ["member area of 1e20", edit((m) => (m.members[0].area = 1e20)), 'member "AC": area is 1e+20, outside the sane range for an area'],
  ["member area of 1e-20", edit((m) => (m.members[1].area = 1e-20)), 'member "BC": area is 1e-20'],
  ["area bound max of 1e15", edit((m) => (m.design.areaBounds.max = 1e15)), "design areaBounds: max"],
  ["displacement limit of 1e30", edit((m) => (m.design.constraints.displacement = [{ node: "C", axis: "y", limit: 1e30 }])), 'displacement limit 1 at node "C": limit'],
  ["self-weight factor of 1e9", edit((m) => (m.loadCases[0].selfWeight = 1e9)), 'load case "LC1": selfWeight'],
  ["volume cap of 1e300", edit((m) => (m.design.constraints.volume = { max: 1e300 })), "volume limit: max"],
];

// the one case that needs bytes, not text
const BYTES: Record<string, Uint8Array> = { "invalid UTF-8": new Uint8Array([0x7b, 0x22, 0xff, 0xfe, 0x22, 0x7d]) };

describe("the malformed-model set", () => {
  it("has sixty cases", () => expect(CASES).toHaveLength(60));

  it.each(CASES)("refuses %s with a 400 naming it", (what, text, expected) => {
    const r = checkModelBytes("malformed.truss.json", BYTES[what] ?? enc(text), LIMIT);
    expect(r.ok, what).toBe(false);
    if (r.ok) return;
    expect(r.status).toBe(400);
    const said = [r.error, ...r.details.map((d) => `${d.path}: ${d.message}`)].join("\n");
    expect(said).toContain(expected);
  });

  it("accepts the unbroken frame, so each refusal above is its case's doing", () => {
    expect(checkModelBytes("frame.truss.json", enc(JSON.stringify(base())), LIMIT).ok).toBe(true);
  });
});

describe("cursors that are not ours", () => {
  it("reads none of them as a position, so the list answers 400 naming the cursor", async () => {
    const { decodeCursor } = await import("~/lib/jobs/queue.server");
    const b64 = (s: string) => Buffer.from(s).toString("base64url");
    for (const bad of ["%%%", "abc", b64("99999999999999999:x"), b64("9999999999999999:x"), b64("12:"), b64(`12:${"a".repeat(500)}`), "a".repeat(5000), b64("12:x\u0000y")])
      expect(decodeCursor(bad), bad.slice(0, 40)).toBeNull();
    expect(decodeCursor(b64("1764662400000:0f3c9a2e-1b7d-4c55-9e61-3a8f2d4b7c10"))).toEqual({ at: new Date(1764662400000), id: "0f3c9a2e-1b7d-4c55-9e61-3a8f2d4b7c10" });
  });
});

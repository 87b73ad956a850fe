// Mechanisms and missing supports are named with node and direction, never NaN.
import { describe, expect, it } from "vitest";
import { analyze, buildStructure, findMechanisms, MechanismError } from "~/engine/truss";
import { model } from "./models";

function mechanismOf(m: ReturnType<typeof model>): MechanismError {
  try {
    analyze(buildStructure(m));
  } catch (e) {
    if (e instanceof MechanismError) return e;
    throw e;
  }
  throw new Error("expected a MechanismError");
}
const load = [{ id: "LC1", loads: [{ node: "C", fy: -10 }] }];

describe("mechanism detection (zero pivot of K, mode recovered from the factor)", () => {
  it("a node held by one member only: free perpendicular to it", () => {
    const e = mechanismOf(model(2, [["A", 0, 0, 0, ["x", "y"]], ["B", 4, 0, 0, ["x", "y"]], ["C", 4, 3]], [["AC", "A", "C"]], load));
    expect(e.node).toBe("C");
    expect(e.message).toMatch(/^node C can move freely in the direction \(-0\.6, 0\.8\)/);
  });
  it("a node on a straight line of members: free in y", () => {
    const e = mechanismOf(model(2, [["A", 0, 0, 0, ["x", "y"]], ["C", 2, 0], ["B", 4, 0, 0, ["x", "y"]]], [["AC", "A", "C"], ["CB", "C", "B"]], load));
    expect([e.node, e.axis]).toEqual(["C", "y"]);
    expect(e.message).toMatch(/node C can move freely in y: add a support or a member/);
  });
  it("no support in x: the whole structure slides", () => {
    const e = mechanismOf(model(2, [["A", 0, 0, 0, ["y"]], ["B", 4, 0, 0, ["y"]], ["C", 2, 2]], [["AB", "A", "B"], ["BC", "B", "C"], ["CA", "C", "A"]], load));
    expect(e.axis).toBe("x");
    expect(e.message).toMatch(/the structure is not supported in x/);
  });
  it("supports that let the structure turn", () => {
    // two rollers both restraining y only at the same x... here: one pin-free triangle held at one node in x and y
    const e = mechanismOf(model(2, [["A", 0, 0, 0, ["x", "y"]], ["B", 4, 0], ["C", 2, 2]], [["AB", "A", "B"], ["BC", "B", "C"], ["CA", "C", "A"]], load));
    expect(e.message).toMatch(/can turn as a rigid body/);
  });
  it("an unbraced panel sways: the nodes that move are listed", () => {
    const e = mechanismOf(model(2, [["A", 0, 0, 0, ["x", "y"]], ["B", 4, 0, 0, ["x", "y"]], ["C", 4, 3], ["D", 0, 3]], [["AB", "A", "B"], ["BC", "B", "C"], ["CD", "C", "D"], ["DA", "D", "A"]], load));
    expect(e.nodes.sort()).toEqual(["C", "D"]);
    expect(e.message).toMatch(/nodes [CD] and [CD] can move together in x without straining any member/);
  });
  it("3D: a node in the plane of its three members is free out of that plane", () => {
    const e = mechanismOf(model(3, [["A", 0, 0, 0, ["x", "y", "z"]], ["B", 4, 0, 0, ["x", "y", "z"]], ["D", 2, 4, 0, ["x", "y", "z"]], ["C", 2, 1, 0]],
      [["AC", "A", "C"], ["BC", "B", "C"], ["DC", "D", "C"]], [{ id: "LC1", loads: [{ node: "C", fz: -1 }] }]));
    expect([e.node, e.axis]).toEqual(["C", "z"]);
  });
  it("a load on a node that no member connects", () => {
    const e = mechanismOf(model(2, [["A", 0, 0, 0, ["x", "y"]], ["B", 4, 0, 0, ["x", "y"]], ["C", 2, 2], ["Z", 9, 9]], [["AC", "A", "C"], ["BC", "B", "C"]], [{ id: "LC1", loads: [{ node: "Z", fx: 1 }] }]));
    expect(e.node).toBe("Z");
    expect(e.message).toMatch(/no member connects it/);
  });
  it("several independent mechanisms are listed by findMechanisms", () => {
    const s = buildStructure(model(2, [["A", 0, 0, 0, ["x", "y"]], ["B", 4, 0, 0, ["x", "y"]], ["C", 2, 0], ["D", 6, 0], ["E", 8, 0, 0, ["x", "y"]]],
      [["AC", "A", "C"], ["CB", "C", "B"], ["BD", "B", "D"], ["DE", "D", "E"]], load));
    const list = findMechanisms(s);
    expect(list.map((m) => `${m.node}:${m.axis}`).sort()).toEqual(["C:y", "D:y"]);
  });
  it("a stable truss has none, and the results are finite", () => {
    const a = analyze(buildStructure(model(2, [["A", 0, 0, 0, ["x", "y"]], ["B", 4, 0, 0, ["y"]], ["C", 2, 2]], [["AB", "A", "B"], ["BC", "B", "C"], ["CA", "C", "A"]], load)));
    expect(a.displacements[0].every(Number.isFinite)).toBe(true);
  });
});

describe("edge cases of the solve", () => {
  it("every node restrained: zero displacements, the load goes into the supports", () => {
    const a = analyze(buildStructure(model(2, [["A", 0, 0, 0, ["x", "y"]], ["B", 3, 0, 0, ["x", "y"]]], [["AB", "A", "B"]], [{ id: "LC1", loads: [{ node: "B", fx: 4 }] }])));
    expect(a.displacements[0].every((v) => v === 0)).toBe(true);
    expect(a.reactions[0][3]).toBe(-4);
    expect(a.equilibriumResidual).toBe(0);
  });
  it("an area that is not positive is named, not turned into NaN", () => {
    const s = buildStructure(model(2, [["A", 0, 0, 0, ["x", "y"]], ["B", 3, 0, 0, ["y"]], ["C", 1, 2]], [["AB", "A", "B"], ["BC", "B", "C"], ["CA", "C", "A"]], [{ id: "LC1", loads: [{ node: "C", fy: -1 }] }]));
    expect(() => analyze(s, { areas: Float64Array.from([1, Number.NaN, 1]) })).toThrow(/member BC has area NaN/);
    const moved = s.coords.slice();
    moved[6] = 3; moved[7] = 0; // C onto B
    expect(() => analyze(s, { coords: moved })).toThrow(/member BC has zero or invalid length/);
  });
});

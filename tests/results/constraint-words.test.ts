// The one rule from an engine constraint or check id to plain words (app/lib/results/constraint-words.ts),
// read by the job page, the compare page, the PDF report and the catalogue tables. The ids are
// the ones the engine writes (app/engine/design/problem.ts, verify.ts, shadow-prices.ts); the
// expected words are the product's own (docs/product.md: no label only the code knows).
import { describe, expect, it } from "vitest";
import {
  constraintKindWords,
  constraintQuantity,
  constraintWords,
  governingCheckKind,
  governingCheckWords,
  parseConstraintId,
} from "~/engine/design/constraint-words";
import { steppedByWords } from "~/lib/results/catalogue-words";
import { caseWords } from "~/lib/results/cases";

const roof = {
  loadCases: [
    { id: "LC1", name: "Dead load" },
    { id: "LC2" },
  ],
  combinations: [{ id: "G+S", name: "Dead and snow" }],
  members: [
    { id: "m5", start: "L3", end: "U4", group: "diagonals" },
    { id: "m6", start: "U4", end: "L4", group: "diagonals" },
    { id: "U4-U5", start: "U4", end: "U5", group: "top-chord" },
    { id: "post", start: "L2", end: "U2" },
  ],
};

describe("constraint ids in plain words", () => {
  it("names the member with its nodes and the load case with its name", () => {
    expect(constraintWords("stress:m5:LC1", roof)).toBe("stress limit of member m5 (nodes L3–U4) under Dead load (LC1)");
    expect(constraintWords("buckling:m6:G+S", roof)).toBe("buckling limit of member m6 (nodes U4–L4) under Dead and snow (G+S)");
    // an id that already says its nodes is not repeated; an unnamed case keeps its id
    expect(constraintWords("stress:U4-U5:LC2", roof)).toBe("stress limit of member U4-U5 under LC2");
  });

  it("reads displacement ids from the end, so a node id may hold a colon", () => {
    expect(constraintWords("displacement:n3:y:LC2", roof)).toBe("displacement limit of node n3 along y under LC2");
    expect(constraintWords("displacement:A:1:x:G+S", roof)).toBe("displacement limit of node A:1 along x under Dead and snow (G+S)");
    expect(parseConstraintId("stress:a:b:LC1")).toEqual({ kind: "stress", member: "a:b", case: "LC1" });
  });

  it("words the design-wide limits and the size and shape bounds", () => {
    expect(constraintWords("volume")).toBe("volume limit");
    expect(constraintWords("equilibrium")).toBe("equilibrium of the re-analysis");
    expect(constraintWords("area-min:diagonals", roof)).toBe("minimum area of group diagonals");
    expect(constraintWords("area-max:post", roof)).toBe("maximum area of member post (nodes L2–U2)");
    expect(constraintWords("shape-min:rise")).toBe("lower end of shape variable rise");
    expect(constraintWords("length:m5", roof)).toBe("shortest allowed length of member m5 (nodes L3–U4)");
    // older results wrote the stress sense into the kind
    expect(constraintWords("stress-compression:m5:LC1")).toBe("compression stress limit of member m5 under LC1");
  });

  it("works without a context, and shows an id it does not know as it is", () => {
    expect(constraintWords("stress:AB:LC1")).toBe("stress limit of member AB under LC1");
    expect(constraintWords("something-new:x")).toBe("something-new:x");
    expect(constraintWords("displacement:C")).toBe("displacement:C");
  });

  it("gives each check the quantity its value and limit are in, and a kind for counts", () => {
    expect(constraintQuantity("stress:m5:LC1")).toBe("stress");
    expect(constraintQuantity("buckling:m5:LC1")).toBe("stress");
    expect(constraintQuantity("displacement:n3:y:LC2")).toBe("length");
    expect(constraintQuantity("volume")).toBe("volume");
    expect(constraintQuantity("area-min:diagonals")).toBe("area");
    expect(constraintQuantity("equilibrium")).toBeNull();
    expect(["stress-tension:a:LC1", "area-min:web", "shape-max:rise", "displacement:C:y:LC1", "mystery"].map(constraintKindWords)).toEqual([
      "stress",
      "minimum size",
      "shape bound",
      "displacement",
      "other",
    ]);
  });

  it("words a member's governing check and the limit that kept a catalogue section", () => {
    expect(governingCheckWords("stress:LC1")).toBe("stress under LC1");
    expect(governingCheckWords("buckling:G+S", roof)).toBe("buckling under Dead and snow (G+S)");
    expect(governingCheckWords(undefined)).toBe("");
    expect(governingCheckKind("buckling:G+S")).toBe("buckling");
    expect(steppedByWords("stress:m5:LC1", roof)).toBe("stress limit of member m5 (nodes L3–U4) under Dead load (LC1)");
    expect(steppedByWords("lightest")).toBe("nothing: the lightest section within its bounds");
    expect(caseWords("LC1", roof)).toBe("Dead load (LC1)");
  });
});

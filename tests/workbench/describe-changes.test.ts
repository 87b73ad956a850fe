// Version differences in words: each kind of change gives its sentence, with the numbers.
import { describe, expect, it } from "vitest";
import { describeChanges } from "~/lib/models/describe-changes";
import { twoBarModel } from "../queue/support/models";

type Obj = Record<string, any>; // eslint-disable-line @typescript-eslint/no-explicit-any

describe("describeChanges", () => {
  const before = twoBarModel("Wharf gantry") as Obj;
  it("names moved nodes, changed loads, added members and changed limits", () => {
    const after = structuredClone(before);
    after.nodes[2].y = 1750;
    after.loadCases[0].loads[0].fy = -45000;
    after.members.push({ id: "AB", start: "A", end: "B", material: "steel", area: 500 });
    after.nodes[1].fixed = ["y"];
    after.design.constraints.displacement = [{ node: "C", axis: "y", limit: 16 }];
    const words = describeChanges(before, after);
    expect(words).toContain("Node C moved 250 mm +y.");
    expect(words).toContain("Support at node B: restrained axes xy → y.");
    expect(words).toContain("Member AB added from A to B.");
    expect(words).toContain("Load case LC1: the load on node C changed from (0, -30000, 0) N to (0, -45000, 0) N.");
    expect(words).toContain("Displacement limit added: node C along y within 16 mm.");
  });
  it("says when nothing changed, and when the design block comes or goes", () => {
    expect(describeChanges(before, structuredClone(before))).toEqual(["No change in the model's content (the file may differ in layout only)."]);
    const { design: _d, ...bare } = structuredClone(before);
    expect(describeChanges(before, bare)).toContain("The design block was removed: the model can be analysed, not optimized.");
    expect(describeChanges(bare, before)).toContain("A design block was added: the model can now be optimized.");
  });
});

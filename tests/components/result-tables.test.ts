// The member and node tables of the two-bar fixture (tests/fixtures/results; closed-form values
// in viewer.test.ts), rendered on the server: the shared table wrapper keeps each table's own
// filter, CSV button, sort order and row ids.
import fs from "node:fs";
import path from "node:path";
import { createElement } from "react";
import { renderToString } from "react-dom/server";
import { describe, expect, it } from "vitest";
import { MemberTable, NodeTable, type Topology } from "~/components/job/result-tables";
import type { TrussResult } from "~/engine/design/result-types";

const dir = path.resolve(import.meta.dirname, "../fixtures/results");
const result = JSON.parse(fs.readFileSync(path.join(dir, "two-bar.result.json"), "utf8")) as TrussResult;
const topology: Topology = { members: new Map(), nodes: new Map() };

describe("result tables", () => {
  it("lists the members with their own filter and CSV button, the fully stressed area A = N / σ = 106.4 mm²", () => {
    const html = renderToString(createElement(MemberTable, { result, topology, fileName: "two-bar" }));
    expect(html).toContain('placeholder="Filter members…"');
    expect(html).toContain('data-testid="members-csv"');
    expect(html).toContain("Members CSV");
    expect((html.match(/data-testid="member-row"/g) ?? []).length).toBe(result.members.length);
    expect(html).toContain("106.4"); // 25,000 N / 235 MPa, four figures (statics, common practice)
  });

  it("prints a member force of rounding noise as 0 and words the governing check", () => {
    // a billionth of the largest force is rounding, not a force (app/lib/format.ts noiseFloor)
    const noisy = structuredClone(result);
    const lc = Object.keys(noisy.members[0]!.force)[0]!;
    noisy.members.push({ ...structuredClone(noisy.members[0]!), id: "idle", force: { [lc]: 5.376e-10 }, stress: { [lc]: 3.424e-13 } });
    const html = renderToString(createElement(MemberTable, { result: noisy, topology, fileName: "two-bar" }));
    expect(html).not.toMatch(/537\.6e-12|342\.4e-15/);
    expect(html).toMatch(/stress under \S+/);
    expect(html).not.toMatch(/>stress:/);
  });

  it("lists the nodes with theirs", () => {
    const html = renderToString(createElement(NodeTable, { result, topology, fileName: "two-bar" }));
    expect(html).toContain('placeholder="Filter nodes…"');
    expect(html).toContain('data-testid="nodes-csv"');
    expect(html).toContain("Nodes CSV");
    expect(html).not.toContain("member-row");
  });
});

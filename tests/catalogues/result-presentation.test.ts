// Reactions, combinations and the catalogue design as the job page, its CSVs, the 3D view's
// data and the PDF report show them, on the gable-bracket fixture (tests/fixtures/results,
// made by make-gable-catalogue.mjs). The fixture's figures are first checked here against the
// closed forms they come from: the bracket is statically determinate, so the method of joints
// at the apex gives N = -P / (2 sin θ) and each foot's reaction balances its member force.
import fs from "node:fs";
import path from "node:path";
import { createElement as h } from "react";
import { renderToString } from "react-dom/server";
import { describe, expect, it } from "vitest";
import { CatalogueDesignPanel } from "~/components/job/CatalogueDesignPanel";
import { ReactionsPanel } from "~/components/job/ReactionsPanel";
import { ResultCasePicker, ResultCaseProvider } from "~/components/job/ResultCase";
import { MemberTable, type Topology } from "~/components/job/result-tables";
import { reactionArrows } from "~/components/viewer/framing";
import { topologyOf } from "~/components/viewer/model-topology";
import { buildTrussView } from "~/components/viewer/truss-view";
import type { TrussResult } from "~/engine/design/result-types";
import { buildReportPdf } from "~/lib/report/document";
import type { ModelFile } from "~/lib/report/report-data";
import { defaultCaseId, governingCaseOf, resultCases } from "~/lib/results/cases";
import { membersCsv, nodesCsv, reactionsCsv } from "~/lib/results/result-csv";
import { pageTexts } from "../report/pdf-text";

const dir = path.resolve(import.meta.dirname, "../fixtures/results");
const result = JSON.parse(fs.readFileSync(path.join(dir, "gable-catalogue.result.json"), "utf8")) as TrussResult;
const modelFile = JSON.parse(fs.readFileSync(path.join(dir, "gable-catalogue.model.json"), "utf8"));
const topology: Topology = { members: new Map(), nodes: new Map() };
/** Server-rendered HTML without React's text-joint comments. */
const render = (el: Parameters<typeof renderToString>[0]) => renderToString(el).replace(/<!-- -->/g, "");
const reaction = (node: string, c: string) => result.reactions!.find((r) => r.node === node)!.values[c]!;

describe("the fixture against its closed forms", () => {
  // geometry: feet 4000 mm apart, apex 1500 mm up, members 2500 mm: sin θ = 0.6, cos θ = 0.8
  const P = 180000; // N at the apex in S
  const W = 7.85e-9 * 1067 * 2500 * 9.80665 * 1000; // N: one member's weight (t · 9.80665 kN/t), docs/model-format.md
  it("snow: N = -P/(2 sin θ) = -150 kN; each foot R = (±0.8, 0.6) · 150 kN (method of joints)", () => {
    expect(result.members[0]!.force.S).toBeCloseTo(-P / 1.2, 6);
    expect(reaction("A", "S")[0]).toBeCloseTo(120000, 4);
    expect(reaction("A", "S")[1]).toBeCloseTo(90000, 4);
    expect(reaction("B", "S")[0]).toBeCloseTo(-120000, 4);
  });
  it("own weight: the feet carry the whole weight 2W, half of it through the members (apex load W)", () => {
    expect(reaction("A", "G")[1] + reaction("B", "G")[1]).toBeCloseTo(2 * W, 6);
    expect(result.members[0]!.force.G).toBeCloseTo(-W / 1.2, 6);
  });
  it("combinations are the factored sums of their cases (superposition)", () => {
    for (const c of result.combinations!)
      for (const node of ["A", "B"])
        for (let k = 0; k < 3; k++) {
          const sum = Object.entries(c.factors).reduce((s, [id, f]) => s + f * reaction(node, id)[k]!, 0);
          expect(reaction(node, c.id)[k]).toBeCloseTo(sum, 4);
        }
  });
});

describe("cases, CSV", () => {
  it("lists load cases then combinations, and opens on the first strength combination", () => {
    const cases = resultCases(result);
    expect(cases.map((c) => `${c.id}:${c.kind}`)).toEqual(["G:load case", "S:load case", "ULS-1:combination", "SLS-1:combination"]);
    expect(defaultCaseId(cases)).toBe("ULS-1");
    expect(governingCaseOf({ governing: "stress:ULS-1" }, ["G", "ULS-1"])).toBe("ULS-1");
  });

  it("members CSV: section, k, every case and combination, the governing combination, units in the headers", () => {
    const t = membersCsv(result);
    expect(t.header).toEqual([
      "member", "start", "end", "group", "section", "area_mm2", "length_mm", "buckling_factor_k",
      "force_G_N", "stress_G_MPa", "force_S_N", "stress_S_MPa", "force_ULS-1_N", "stress_ULS-1_MPa", "force_SLS-1_N", "stress_SLS-1_MPa",
      "utilization", "governing_check", "governing_case",
    ]);
    expect(t.rows[0]!.slice(0, 8)).toEqual(["AC", "A", "C", "rafters", "CHS 88.9x4.0", 1067, 2500, 0.9]);
    expect(t.rows[0]!.at(-1)).toBe("ULS-1");
    expect(t.rows[0]!.at(-2)).toBe("stress"); // the check's kind in words, its case in the last column (no "stress:ULS-1")
    expect(nodesCsv(result).header).toContain("uy_SLS-1_mm");
  });

  it("reactions CSV: three components per case, then the sum and the applied load it balances", () => {
    const t = reactionsCsv(result);
    expect(t.header.slice(0, 4)).toEqual(["node", "Rx_G_N", "Ry_G_N", "Rz_G_N"]);
    expect(t.header).toContain("Ry_ULS-1_N");
    expect(t.rows.map((r) => r[0])).toEqual(["A", "B", "(sum of reactions)", "(applied loads and own weight)"]);
    const col = t.header.indexOf("Ry_ULS-1_N");
    expect((t.rows[2]![col] as number) + (t.rows[3]![col] as number)).toBeCloseTo(0, 6);
  });
});

describe("the job page's parts (server render)", () => {
  it("the reactions table follows the page's case, with the balance shown as figures", () => {
    const html = render(h(ResultCaseProvider, { result }, h(ResultCasePicker), h(ReactionsPanel, { result, fileName: "gable" })));
    expect(html).toContain("Support reactions, ULS-1");
    expect((html.match(/data-testid="reaction-row"/g) ?? []).length).toBe(2);
    expect(html).toContain("sum of reactions");
    expect(html).toContain("applied loads + own weight");
    expect(html).toMatch(/balance to rounding|balance —/);
    expect(html).toContain("1.35 × G + 1.5 × S");
    expect(html).toContain('<optgroup label="Combinations">');
    // ULS-1 at foot A: Ry = 1.35 · W + 1.5 · 90 kN = 135,277 N, four figures
    expect(html).toContain('<td>A</td><td class="num">180,200</td><td class="num">135,300</td>');
  });

  it("the member table shows the section and k, and has no picker of its own inside the page's", () => {
    const html = render(h(ResultCaseProvider, { result }, h(MemberTable, { result, topology, fileName: "gable" })));
    expect(html).toContain("CHS 88.9x4.0");
    expect(html).toContain("buckling factor k");
    expect(html).toContain("governing case");
    expect(html).not.toContain('data-testid="result-case"');
  });

  it("the catalogue design beside the continuous one: both masses, the gap, what made the group step up", () => {
    const html = render(h(CatalogueDesignPanel, { result }));
    expect(html).toContain("0.037617"); // continuous: 2 · 7.85e-9 · 958.4 · 2500 = 0.0376172 t
    expect(html).toContain("0.041880"); // catalogue: 2 · 7.85e-9 · 1067 · 2500 = 0.0418798 t
    expect(html).toContain("11.3 %"); // 1067 / 958.4 - 1
    expect(html).toContain("stress limit of member AC (nodes A–C) under Strength: own weight + snow (ULS-1)"); // app/lib/results/constraint-words.ts
  });
});

describe("the 3D view's data", () => {
  it("offers the combinations with their factored loads, and reaction arrows per case", () => {
    const view = buildTrussView(topologyOf(modelFile)!, result);
    expect(view.loadCases.map((c) => c.id)).toEqual(["G", "S", "ULS-1", "SLS-1"]);
    const uls = view.loadCases.findIndex((c) => c.id === "ULS-1");
    expect(view.loadCases[uls]!.loads[0]!.f[1]).toBeCloseTo(-1.5 * 180000, 6);
    const arrows = reactionArrows(view, uls);
    expect(arrows).toHaveLength(2);
    expect(arrows[0]!.tip).toEqual([0, 0, 0]); // head on support A
    expect(arrows[0]!.dir[0]).toBeGreaterThan(0); // the foot is pushed inwards: the member thrusts outwards
  });
});

describe("the PDF report", () => {
  it("prints the reactions of every case and combination, the balance, and the catalogue design", async () => {
    const pdf = await buildReportPdf({
      job: { id: "job-gable4", status: "succeeded", options: {}, createdAt: new Date("2026-11-30T09:00:00Z"), startedAt: null, finishedAt: null, submitter: null },
      project: { code: "HX-7", name: "Hollins Cross bus shelter" },
      model: { id: "m", name: result.model, fileName: "gable.truss.json", sha256: "0".repeat(64), sizeBytes: 1, uploadedAt: null, file: modelFile as ModelFile },
      result,
      reviews: [],
      generatedAt: new Date("2026-11-30T16:00:00Z"),
    });
    const text = (await pageTexts(pdf)).join("\n");
    expect(text).toContain("Support reactions");
    expect(text).toContain("ULS-1 Rx (N)");
    expect(text).toContain("Balance of reactions and loads");
    expect(text).toContain("Catalogue design beside the continuous optimum");
    expect(text).toContain("CHS 88.9x4.0");
    expect(text).toContain("Forces and stresses, load cases G, S, ULS-1");
  });
});

describe("a model whose members name only their section", () => {
  it("draws each member with its section's area (the viewer's topology)", () => {
    const t = topologyOf(modelFile)!;
    expect(t.members.map((m) => m.area)).toEqual([1067, 1067]); // CHS 88.9x4.0 of the fixture's sections
  });
});

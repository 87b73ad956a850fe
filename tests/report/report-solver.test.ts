// A report made from a real solver run, not a fixture: the symmetric two-bar truss with its
// apex height free. Closed form (common practice; the two-bar example of structural
// optimization texts, from memory): the optimum has the apex as high as the half-span,
// b = 1000 mm, so the bars sit at 45°, each 1000·√2 = 1414.2 mm long, carrying
// P / (2 sin 45°) = 100000 / √2 = 70711 N in compression, needing 70711 / 200 = 353.6 mm².
import { describe, expect, it } from "vitest";
import fs from "node:fs";
import { optimizeModel } from "~/engine/design";
import { parseModel } from "~/engine/truss";
import { buildReportPdf } from "~/lib/report/document";
import type { ModelFile } from "~/lib/report/report-data";
import { pageTexts } from "./pdf-text";

describe("report of a solved two-bar truss", () => {
  it("prints the closed-form optimum the solver reached", async () => {
    const json = JSON.parse(fs.readFileSync("tests/fixtures/models/design/two-bar-shape.truss.json", "utf8")) as ModelFile;
    const parsed = parseModel(json);
    if (!parsed.ok) throw new Error(parsed.errors.map((e) => `${e.path}: ${e.message}`).join("; "));
    const result = optimizeModel(parsed.model);
    expect(result.status).toBe("optimal");
    const pdf = await buildReportPdf({
      job: { id: "job-2bar", status: "succeeded", options: {}, createdAt: new Date("2026-11-30T10:00:00Z"), startedAt: null, finishedAt: null, submitter: "Ines Okafor" },
      project: { code: "QA-1", name: "Solver acceptance" },
      model: { id: "m", name: json.name!, fileName: "two-bar-shape.truss.json", sha256: "c".repeat(64), sizeBytes: 1500, uploadedAt: null, file: json },
      result,
      reviews: [],
      generatedAt: new Date("2026-11-30T12:00:00Z"),
    });
    const all = (await pageTexts(pdf)).join("\n");
    expect(all).toMatch(/LC L–C bars 353\.6 1,414\.2 100\.0 %/);
    expect(all).toMatch(/RC R–C bars 353\.6 1,414\.2 100\.0 %/);
    expect(all).toMatch(/LC −70,710 −200\.0/); // 70711 N to four figures
    expect(all).toMatch(/apex-rise 600\.000 −300\.0 2,000/); // apex from y = 400 up to y = 1000
    expect(all).toContain("optimal: the solver met its optimality and feasibility tolerances");
    expect(all).toContain(result.message);
  });

  it("prints what each criterion costs, the members at their minimum size and the deflections of the ten-bar benchmark", async () => {
    // ten-bar cantilever (Haftka & Gurdal, optimum near 5060.8 lb, from memory): the 2 in tip
    // deflection governs, three members end at the 0.1 in² minimum area
    const json = JSON.parse(fs.readFileSync("tests/fixtures/models/design/ten-bar.truss.json", "utf8")) as ModelFile;
    const parsed = parseModel(json);
    if (!parsed.ok) throw new Error(parsed.errors.map((e) => `${e.path}: ${e.message}`).join("; "));
    const result = optimizeModel(parsed.model, { formulation: "nested", starts: 1 });
    expect(result.status).toBe("optimal");
    const pdf = await buildReportPdf({
      job: { id: "job-10bar", status: "succeeded", options: {}, createdAt: new Date("2026-11-30T10:00:00Z"), startedAt: null, finishedAt: null, submitter: "Ines Okafor" },
      project: { code: "QA-1", name: "Solver acceptance" },
      model: { id: "m", name: json.name!, fileName: "ten-bar.truss.json", sha256: "c".repeat(64), sizeBytes: 1500, uploadedAt: null, file: json },
      result,
      reviews: [],
      generatedAt: new Date("2026-11-30T12:00:00Z"),
    });
    const all = (await pageTexts(pdf)).join("\n");
    expect(all).toMatch(/Limits that govern 2 limits bind at the final design/);
    expect(all).toMatch(/3 of 10 members sit at their minimum area: member m\d+ \(0\.1000 in²\), member m\d+ \(0\.1000 in²\), member m\d+ \(0\.1000 in²\)\./);
    const top = result.criterionCosts![0]!;
    expect(top.id).toBe("deflection:0");
    expect(all).toContain("1. Raising the deflection limit at every node in every direction (2.000 in) by 1 % would save about 49 lb, 1.0 % of the mass; it binds at node 1 in y under LC1.");
    // the compression allowable does not bind: one line, no table row saying "does not bind"
    expect(all).toContain("1 other criterion does not bind at this design: the allowable compression stress of aluminium.");
    expect(all).not.toContain("Other criteria that bind");
    expect(all).not.toContain("does not bind at this design –");
    // stress in ksi for kip and in, the same spelling in tables and sentences
    expect(all).toContain("ksi");
    expect(all).not.toMatch(/kip\/in²/);
    expect(all).toMatch(/Tip loads \(LC1\) node 1, y −2\.000 2\.000 100\.0 % node 1, y −2\.000/);
  });
});

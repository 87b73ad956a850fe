// The calculation record read back by poppler's pdftotext: it carries the job's figures, the
// cautions and the right review mark on every page. The truss is a determinate Warren roof
// truss whose forces follow by hand from the method of sections (warren-fixture.ts).
import { beforeAll, describe, expect, it } from "vitest";
import { CAUTION_TEXT } from "~/lib/report/cautions";
import { buildReportPdf } from "~/lib/report/document";
import type { ReportReview } from "~/lib/report/report-data";
import { fonts, pageCount, pageTexts } from "./pdf-text";
import { reportDataFor, warrenFixture, type WarrenFixture } from "./warren-fixture";

const approvedBy: ReportReview = {
  id: "rev-2",
  decision: "approved",
  comment: "Chord groups checked by hand against the section method; agreed.",
  reviewer: "Priya Vantongeren",
  at: new Date("2026-11-30T15:10:00Z"),
};
const returnedBy: ReportReview = {
  id: "rev-1",
  decision: "changes-requested",
  comment: "Add the drift case on the right half.",
  reviewer: "Tomasz Réveillon",
  at: new Date("2026-11-30T11:00:00Z"),
};

let fx: WarrenFixture;
let unreviewed: string[];
let unreviewedPdf: Uint8Array;
beforeAll(async () => {
  fx = warrenFixture({ panels: 8 });
  unreviewedPdf = await buildReportPdf(reportDataFor(fx));
  unreviewed = await pageTexts(unreviewedPdf);
});

describe("the report before review", () => {
  it("marks every page NOT REVIEWED and numbers the pages", () => {
    expect(unreviewed.length).toBeGreaterThan(4);
    if (pageCount(unreviewedPdf) !== null) expect(pageCount(unreviewedPdf)).toBe(unreviewed.length);
    unreviewed.forEach((p, i) => {
      expect(p, `page ${i + 1}`).toContain("NOT REVIEWED — no checker has approved this calculation");
      expect(p, `page ${i + 1}`).toContain(`page ${i + 1} of ${unreviewed.length}`);
      expect(p).not.toContain("APPROVED by");
    });
  });

  it("names the job, the people, the solver and the input file's SHA-256 on the cover", () => {
    const cover = unreviewed[0]!;
    for (const s of [
      "FLD-24 — Fenwick Lane depot extension",
      "Warren roof truss, 8 panels",
      "job-7q2c9x",
      "Ines Okafor <ines.okafor@brightspan.example>",
      "2026-11-30 09:00:31 UTC",
      "strutwise-sqp 0.1.0, nested formulation",
      "9c1f0a6e4b7d2c3a8e5f6b1d0c9a7e2f4b6d8a0c1e3f5a7b9d2c4e6f8a0b1c3d",
    ])
      expect(cover).toContain(s);
  });

  it("carries the licensed-engineer cautions in full", () => {
    expect(unreviewed[0]).toContain(CAUTION_TEXT);
    // the meaning of product.md's cautions, word for word where it lists what must be checked
    for (const s of ["design aid, not a design", "lateral-torsional and local buckling", "connections, fatigue", "second-order effects", "fabrication and erection"])
      expect(unreviewed[0]).toContain(s);
  });

  it("shows the solver figures: objective initial and final, iterations, KKT residual, violation", () => {
    const all = unreviewed.join("\n");
    // fixture mass figures to five significant figures, as the report prints them
    expect(all).toContain(`initial ${Number(fx.initialMass.toPrecision(5))}, final ${Number(fx.finalMass.toPrecision(5))}`);
    expect(all).toContain("9 iterations, 12 analyses");
    expect(all).toContain("4.13e-9 (scaled)");
    expect(all).toMatch(/Largest violation 0 \(relative/);
  });

  it("prints the member forces the method of sections gives by hand", () => {
    const all = unreviewed.join("\n");
    // LC1: 40 kN at each of the 8 top nodes, so each support takes 160 kN. Bottom chord BC4
    // (L3-L4), moments about U4 at x = 8750 mm: M = 160000·8750 − 40000·(7500 + 5000 + 2500)
    // = 8.0e8 N·mm; force = M / h = 8.0e8 / 2000 = 400000 N tension (method of sections,
    // common practice). Its group then needs 400000 / 235 = 1702 mm² (fully stressed).
    expect(all).toMatch(/BC4 L3–L4 bottom-chord 1,702 2,500\.0 100\.0 % stress under LC1/);
    expect(all).toMatch(/BC4 400,000 235\.0 /);
    // End diagonal D1 (L0-U1) in LC1: shear 160000 N, sin θ = 2000 / 2358.5, force −188680 N
    expect(all).toMatch(/D1 −188,700 /);
  });

  it("lists the governing limits apart from the members at their minimum size, and the verification record", () => {
    const all = unreviewed.join("\n");
    expect(all).toContain("4 What governs the design and what it costs");
    // the stress limits that bind, in words with their shadow prices; no minimum-area bound among them
    expect(all).toMatch(/Limits that govern \d+ limits bind at the final design/);
    // in words with the member's nodes and the case's name; stress in MPa as everywhere else
    expect(all).toMatch(/stress limit of member TC4 \(nodes U4–U5\) under Roof dead load and snow \(LC1\) 0\.00215 t per MPa/);
    expect(all).not.toContain("N/mm²");
    expect(all).not.toMatch(/lower area bound/);
    // every member of this truss is stress-governed above the 150 mm² minimum
    expect(all).toContain("Members at their minimum size No member sits at its minimum area.");
    expect(all).toContain("5 Independent verification of the final design");
    expect(all).toMatch(/All limits met yes/);
    expect(all).toMatch(/Checks performed 62/);
  });

  it("draws the plot and the truss with their legends, and embeds the shipped fonts", () => {
    const all = unreviewed.join("\n");
    expect(all).toContain("KKT residual (right axis)");
    // one continuous scale with named ends and the over-limit pattern, no discrete bands
    for (const words of ["utilization 0 %", "over its limit (striped, red outline)"]) expect(all).toContain(words);
    expect(all).not.toContain("75–90 %");
    const f = fonts(unreviewedPdf);
    if (f) {
      expect(f.some((x) => x.name.includes("IBMPlexSans-Regular") && x.embedded)).toBe(true);
      expect(f.some((x) => x.name.includes("RobotoMono-Regular") && x.embedded)).toBe(true);
      expect(f.every((x) => x.embedded)).toBe(true);
    }
  });
});

describe("the report after review", () => {
  it("after approval names who approved and when, with the comment, and drops the NOT REVIEWED mark", async () => {
    const pages = await pageTexts(await buildReportPdf(reportDataFor(fx, [returnedBy, approvedBy])));
    pages.forEach((p, i) => {
      expect(p, `page ${i + 1}`).toContain("APPROVED by Priya Vantongeren on 2026-11-30 15:10:00 UTC");
      expect(p, `page ${i + 1}`).not.toContain("NOT REVIEWED");
      expect(p).not.toContain("NOT APPROVED");
    });
    expect(pages[0]).toContain("Comment: Chord groups checked by hand against the section method; agreed.");
    // the earlier decision stays in the review record
    expect(pages[0]).toMatch(/2026-11-30 11:00:00 UTC · Tomasz Réveillon · changes requested Add the drift case on the right half\./);
  });

  it("shows a changes-requested decision as such on every page", async () => {
    const pages = await pageTexts(await buildReportPdf(reportDataFor(fx, [returnedBy])));
    pages.forEach((p, i) => {
      expect(p, `page ${i + 1}`).toContain("CHANGES REQUESTED — NOT APPROVED (Tomasz Réveillon, 2026-11-30 11:00:00 UTC)");
      expect(p).not.toContain("APPROVED by");
    });
    expect(pages[0]).toContain("Comment: Add the drift case on the right half.");
  });

  it("a later approval supersedes a request for changes, and a later request an approval", async () => {
    const again = { ...returnedBy, id: "rev-3", at: new Date("2026-12-01T09:00:00Z") };
    const pages = await pageTexts(await buildReportPdf(reportDataFor(fx, [approvedBy, again])));
    expect(pages[0]).toContain("CHANGES REQUESTED — NOT APPROVED");
    expect(pages[pages.length - 1]).toContain("CHANGES REQUESTED — NOT APPROVED");
  });
});

describe("large tables and other alphabets", () => {
  it("paginates a long member table without losing or repeating a row", async () => {
    const big = warrenFixture({ panels: 40, loadScale: (8 / 40) ** 2 }); // 159 members, 81 nodes
    const pages = await pageTexts(await buildReportPdf(reportDataFor(big)));
    const all = pages.join("\n");
    expect(all).toContain("159 members (continued)");
    // the results member table prints "id start–end": each member exactly once there
    for (const m of big.result.members) {
      const row = new RegExp(`(^| )${m.id} ${m.start}–${m.end} `, "g");
      expect(all.match(row)?.length, m.id).toBe(1);
    }
    pages.forEach((p, i) => expect(p, `page ${i + 1}`).toContain("NOT REVIEWED"));
  });

  it("sets Latin Extended and Greek letters from their own font subsets", async () => {
    const data = reportDataFor(fx);
    data.model.name = "Dvořák Street footbridge, span Ł-2";
    data.project.name = "Øresund quay — σ check";
    const pages = await pageTexts(await buildReportPdf(data));
    // pdftotext may put a space where the font subset changes mid-word: compare without spaces
    const first = pages[0]!.replace(/\s+/g, "");
    expect(first).toContain("DvořákStreetfootbridge,spanŁ-2");
    expect(first).toContain("Øresundquay—σcheck");
  });

  it("sets Cyrillic names, drops bidi controls, and names a character no font holds instead of printing ?", async () => {
    const data = reportDataFor(fx);
    // Cyrillic from the shipped cyrillic subsets; U+202E (right-to-left override) would
    // otherwise show "fdp.exe" reversed in a reader that honours it; 中 (U+4E2D) has no font here
    data.model.name = "Мост через Ждановку, ферма Б";
    data.project.name = "Quay \u202Efdp.exe roof 中";
    const pages = await pageTexts(await buildReportPdf(data));
    const first = pages[0]!.replace(/\s+/g, ""); // as above: subset changes may add spaces
    expect(first).toContain("МостчерезЖдановку,фермаБ");
    expect(first).toContain("Quayfdp.exeroof[noglyphU+4E2D]");
    expect(first).not.toContain("\u202E");
    expect(first).not.toContain("?");
  });
});

describe("results that need attention", () => {
  it("reports failed verification checks and a non-optimal status in words", async () => {
    const f = warrenFixture({ panels: 4 });
    const data = reportDataFor(f);
    const r = structuredClone(data.result);
    r.status = "not-converged";
    r.message = "Stopped at the iteration limit (200) with the KKT residual at 3.2e-4";
    r.hint = "Raise the iteration limit or start from larger areas";
    // a member overstressed by 4 %: the verification must say so, and the table flag it
    const bad = { id: "stress:BC2:LC1", kind: "stress" as const, value: 244.4, limit: 235, ratio: 1.04, ok: false };
    r.verification = { ...r.verification!, allLimitsMet: false, failures: [bad], maxUtilization: 1.04 };
    r.members[1]!.utilization = 1.04;
    const pages = await pageTexts(await buildReportPdf({ ...data, result: r }));
    const all = pages.join("\n");
    expect(all).toContain("State finished — stopped before converging: the solver stopped before meeting its tolerances");
    // a best design that breaks a limit is nothing to sign off: every page says so instead of NOT REVIEWED
    for (const p of pages) {
      expect(p).toContain("NOT A DESIGN TO ISSUE: finished — stopped before converging; no checker is asked to review it");
      expect(p).not.toContain("NOT REVIEWED");
    }
    expect(all).toContain("What to try Raise the iteration limit or start from larger areas");
    expect(all).toContain("All limits met NO: 1 check failed");
    // the drawing is the best design found, not "the optimized truss" (the job page's words)
    expect(all).toContain("Best design found (the run stopped before converging)");
    expect(all).not.toMatch(/optimized truss/i);
    // multipliers away from a proved optimum are not offered as prices
    expect(all).toMatch(/\d+ limits are active at the design this run ended with\. They are not priced/);
    expect(all).not.toMatch(/Shadow price Unit/);
    // the check in words, value and limit with their unit; the engine's id only in its labelled column
    expect(all).toMatch(/Failed checks Check Value Limit Unit Ratio Result Check id stress limit of member BC2 \(nodes L1–L2\) under LC1 244\.4 235\.0 MPa 104\.0 % FAILED stress:BC2:LC1/);
    expect(all).toMatch(/BC2 L1–L2 bottom-chord \S+ 2,500\.0 104\.0 %/);
  });

  it("counts and names the members at their minimum size apart from the governing limits", async () => {
    const data = reportDataFor(fx);
    const r = structuredClone(data.result);
    // the lightest diagonals down at the 150 mm² minimum of the model's area bounds
    for (const m of r.members) if (m.id === "D6" || m.id === "D9") m.area = 150;
    r.activeConstraints.push({ id: "area-min:D6", multiplier: 0.3 }, { id: "area-min:D9", multiplier: 0.2 });
    const all = (await pageTexts(await buildReportPdf({ ...data, result: r }))).join("\n");
    expect(all).toContain("2 of 31 members sit at their minimum area: member D6 (150.0 mm²), member D9 (150.0 mm²).");
    expect(all).not.toMatch(/lower area bound|minimum area of D6/);
  });

  it("prints rounding noise as 0 in the force, stress, displacement and reaction tables", async () => {
    // a member the load case leaves unloaded comes out of the solve with a force of about 1e-9
    // of the largest one, not 0: that is rounding, not a force (common practice: a billionth of
    // the column's largest value, app/lib/format.ts noiseFloor)
    const f = warrenFixture({ panels: 4 });
    const data = reportDataFor(f);
    const r = structuredClone(data.result);
    const m = r.members.find((x) => x.id === "D4")!;
    m.force.LC1 = 5.376e-10;
    m.stress.LC1 = 3.424e-13;
    r.nodes[0]!.displacement.LC1 = [4.892e-15, 0, 0];
    const all = (await pageTexts(await buildReportPdf({ ...data, result: r }))).join("\n");
    expect(all).toMatch(/D4 0 0 /);
    expect(all).not.toMatch(/5\.376e-12|537\.6e-12|342\.4e-15|4\.892e-15/);
  });

  it("words the active constraints itself when the result has no shadow prices", async () => {
    const f = warrenFixture({ panels: 4 });
    const data = reportDataFor(f);
    const r = structuredClone(data.result);
    delete r.shadowPrices;
    r.activeConstraints = [
      { id: "displacement:U2:y:LC1", multiplier: 0.0125 },
      { id: "volume", multiplier: 2.5e-9 },
    ];
    const all = (await pageTexts(await buildReportPdf({ ...data, result: r }))).join("\n");
    expect(all).toContain("2 limits bind at the final design");
    expect(all).toContain("displacement limit of node U2 along y under Roof dead load and snow (LC1) 0.0125 t per mm");
    expect(all).toContain("volume limit 2.50e-9 t per mm³");
  });
});

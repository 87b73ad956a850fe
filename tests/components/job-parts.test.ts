// The job page's pure parts: queue form → job options (the shared jobOptionsSchema decides),
// live-poll merging, and the server render of the result
// panels from the two-bar fixture (closed-form values, see viewer.test.ts).
import fs from "node:fs";
import path from "node:path";
import { createElement } from "react";
import { renderToString } from "react-dom/server";
import { describe, expect, it } from "vitest";
import { ConvergencePlot } from "~/components/charts/ConvergencePlot";
import { GoverningConstraints } from "~/components/job/GoverningConstraints";
import { mergeLive, type JobListRow } from "~/components/job/JobsList";
import { normalizeHistory } from "~/components/job/LiveProgress";
import { OutcomePanel } from "~/components/job/OutcomePanel";
import { parseQueueForm } from "~/components/job/queue-form";
import { Cautions } from "~/components/ui/Cautions";
import type { TrussResult } from "~/engine/design/result-types";

const result = JSON.parse(fs.readFileSync(path.resolve(import.meta.dirname, "../fixtures/results/two-bar.result.json"), "utf8")) as TrussResult;
const form = (o: Record<string, string>) => (n: string) => o[n] ?? null;

describe("queue form", () => {
  it("leaves empty and 'default' fields to the model's design block", () => {
    expect(parseQueueForm(form({ formulation: "default", maxIterations: "" }))).toEqual({ ok: true, options: {} });
  });

  it("turns fields into typed options", () => {
    const r = parseQueueForm(form({ formulation: "simultaneous", objective: "compliance", maxIterations: "150", tolerance: "1e-7", displacementLimit: "25", stress: "off", buckling: "on" }));
    expect(r).toEqual({ ok: true, options: { formulation: "simultaneous", objective: "compliance", maxIterations: 150, tolerance: 1e-7, displacementLimit: 25, stress: false, buckling: true } });
  });

  it("names the field of every problem", () => {
    const r = parseQueueForm(form({ maxIterations: "12.5", tolerance: "abc", volumeMax: "-3" }));
    expect(r.ok).toBe(false);
    if (r.ok) return;
    expect(r.fieldErrors.tolerance).toMatch(/Tolerance must be a number/);
    // the number-parse problem is reported first; fix it and the schema speaks
    const r2 = parseQueueForm(form({ maxIterations: "12.5", volumeMax: "-3", formulation: "sideways" }));
    expect(r2.ok).toBe(false);
    if (r2.ok) return;
    expect(r2.fieldErrors.maxIterations).toMatch(/^Iteration cap: /);
    expect(r2.fieldErrors.volumeMax).toMatch(/^Volume limit: /);
    expect(r2.fieldErrors.formulation).toMatch(/^Formulation: /);
  });
});

describe("live updates", () => {
  it("merges fresh status and progress into the rows by id, leaving others alone", () => {
    const rows: JobListRow[] = [
      { id: "a", status: "running", outcome: null, modelName: "m", projectCode: "P", submitter: "x", createdAt: "2026-01-01T00:00:00Z", finishedAt: null, objective: null, progress: { iteration: 2 } },
      { id: "b", status: "queued", outcome: null, modelName: "m", projectCode: "P", submitter: "x", createdAt: "2026-01-01T00:00:00Z", finishedAt: null, objective: null, progress: null },
    ];
    const merged = mergeLive(rows, [{ id: "a", status: "succeeded", outcome: "optimal", finishedAt: "2026-01-01T00:01:00Z", progress: { iteration: 9 }, summary: { objectiveKind: "mass", objectiveFinal: 0.287 } }]);
    expect(merged[0]).toMatchObject({ status: "succeeded", outcome: "optimal", objective: { kind: "mass", final: 0.287 }, progress: { iteration: 9 } });
    expect(merged[1]).toBe(rows[1]);
  });

  it("reads the progress route's history in either shape, sorted by iteration", () => {
    const h = normalizeHistory({ history: [{ iteration: 2, objective: 1, maxViolation: 0, kktResidual: 1e-3 }, { iteration: 1, objective: 2, maxViolation: 0.1, kktResidual: null }] });
    expect(h.map((x) => x.iteration)).toEqual([1, 2]);
    expect(h[0]!.kktResidual).toBeNull();
    expect(normalizeHistory([{ iteration: 0, f: 5, maxViolation: 0, kktResidual: 1 }])[0]!.objective).toBe(5);
    expect(normalizeHistory(null)).toEqual([]);
  });
});

describe("result panels (server render)", () => {
  it("states the shadow prices in the result's own sentences", () => {
    const html = renderToString(createElement(GoverningConstraints, { result }));
    expect(html).toContain("Allowing member AC one more MPa of compression stress would save about 9.8e-6 t.");
    expect(html).toContain("check id: stress:AC:LC1");
  });

  it("falls back to plain words built from the constraint id without shadow prices", () => {
    const html = renderToString(createElement(GoverningConstraints, { result: { ...result, shadowPrices: undefined } }));
    expect(html).toContain("stress limit of member AC (nodes A–C) under Hoist at apex (LC1)");
    // the unit is spelled from the id and the model's units, stress in MPa for N and mm
    expect(html.replace(/<!-- -->/g, "")).toContain("9.80e-6 t per MPa");
  });

  it("says what happened and what to try for a run that found no feasible design", () => {
    const html = renderToString(createElement(OutcomePanel, { status: "succeeded", outcome: "infeasible", message: "Stress limits of members 3 and 7 cannot both be met", hint: null }));
    expect(html).toContain("No design meets every limit");
    expect(html).toContain("Stress limits of members 3 and 7 cannot both be met");
    expect(html).toContain("What to try");
  });

  it("draws the three convergence series, the KKT residual falling over ten decades on the log axis", () => {
    const html = renderToString(createElement(ConvergencePlot, { history: normalizeHistory(result.history), objectiveLabel: "mass" }));
    expect((html.match(/<path /g) ?? []).length).toBe(3);
    // a residual below the plot's floor (1e-9) is drawn on the floor line, not beneath it
    expect(html).toContain("1e−9");
    expect(html).toContain("KKT residual");
  });

  it("carries the licensed-engineer cautions of product.md", () => {
    const html = renderToString(createElement(Cautions));
    for (const phrase of ["design aid, not a design", "licensed or chartered structural engineer", "lateral-torsional", "connections", "fatigue", "second-order", "fabrication and erection"])
      expect(html).toContain(phrase);
  });
});

// The deflection summary (worst displacement per load case and combination against its limit)
// against closed forms.
import { describe, expect, it } from "vitest";
import { analyseModel } from "~/engine/design";
import { optimizeContinuous } from "~/engine/design/result";
import { fixture, parse } from "./models";

describe("deflection summary", () => {
  // Symmetric two-bar truss, apex load P down: each bar carries N = P / (2 sin t), and the apex
  // sinks by delta = P L / (2 E A sin^2 t) (method of joints and the virtual-work deflection of
  // a two-bar truss; common practice).
  const raw = JSON.parse(JSON.stringify(fixture("two-bar-shape.truss.json")));
  raw.loadCases.push({ id: "W", name: "Side load", loads: [{ node: "C", fx: 20000 }] });
  raw.combinations = [
    { id: "ULS", use: "strength", factors: { P: 1.35, W: 1.5 } },
    { id: "SLS", use: "service", factors: { P: 1 } },
  ];
  raw.design.constraints.displacement = [{ node: "C", axis: "y", limit: 3 }];
  const model = parse(raw);
  const P = 100000, E = 210000, A = 800, b = 1000, h = 400;
  const L = Math.hypot(b, h);
  const sin = h / L;
  const delta = (P * L) / (2 * E * A * sin * sin);

  it("reads the two-bar apex deflection of every case and combination, checking only the service one", () => {
    const r = analyseModel(model);
    const by = new Map(r.deflections!.map((d) => [d.case, d]));
    expect([...by.keys()]).toEqual(["P", "W", "ULS", "SLS"]);
    const p = by.get("P")!;
    expect(p.largest.node).toBe("C");
    expect(p.largest.axis).toBe("y");
    expect(p.largest.value / -delta).toBeCloseTo(1, 10);
    // the limits apply to service combinations only once the model has combinations
    expect(p.checked).toBe(false);
    expect(p.governing).toBeUndefined();
    const sls = by.get("SLS")!;
    expect(sls.checked).toBe(true);
    expect(sls.governing).toMatchObject({ node: "C", axis: "y", limit: 3, spec: 0 });
    expect(sls.governing!.value / -delta).toBeCloseTo(1, 10);
    expect(sls.governing!.ratio).toBeCloseTo(delta / 3, 10);
    expect(by.get("ULS")!.checked).toBe(false);
    // a horizontal apex load alone: N = +-H / (2 cos t), delta_x = H L / (2 E A cos^2 t)
    const H = 20000, cos = b / L;
    const w = by.get("W")!;
    expect(w.largest).toMatchObject({ node: "C", axis: "x" });
    expect(w.largest.value / ((H * L) / (2 * E * A * cos * cos))).toBeCloseTo(1, 10);
  });

  it("puts the ten-bar's optimum on its 2 in deflection limit (Haftka & Gurdal benchmark, from memory)", () => {
    const r = optimizeContinuous(fixture("ten-bar.truss.json"), { formulation: "nested" });
    expect(r.status).toBe("optimal");
    const [lc] = r.deflections!;
    expect(lc.checked).toBe(true);
    expect(lc.governing).toMatchObject({ node: "1", axis: "y", limit: 2, spec: 0 });
    expect(lc.governing!.ratio).toBeCloseTo(1, 5);
    expect(Math.abs(lc.largest.value)).toBeCloseTo(2, 5);
  });
});

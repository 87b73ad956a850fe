// The viewer's data and geometry. The fixture is the symmetric two-bar bracket of
// tests/fixtures/results: apex load P = 30 kN, bars at sin θ = 0.6, so each bar carries
// N = P / (2 sin θ) = 25 kN in compression, and at σ = 235 MPa the apex sinks by
// v = N L / (E A sin θ) = 4.66 mm (closed form, statics of a symmetric two-bar truss).
import fs from "node:fs";
import path from "node:path";
import * as THREE from "three";
import { describe, expect, it } from "vitest";
import { placeCone, placeCylinder } from "~/components/viewer/instancing";
import { forceSense } from "~/components/viewer/palette";
import { boundsOf, buildTrussView, defaultDeformationScale, deformedPositions, niceNumber, upAxis, visualRadii, type ModelLike, type ResultLike } from "~/components/viewer/truss-view";

const dir = path.resolve(import.meta.dirname, "../fixtures/results");
const model = JSON.parse(fs.readFileSync(path.join(dir, "two-bar.model.json"), "utf8")) as ModelLike;
const result = JSON.parse(fs.readFileSync(path.join(dir, "two-bar.result.json"), "utf8")) as ResultLike;

describe("truss view", () => {
  it("indexes members by node and carries the result's areas, utilization and forces", () => {
    const v = buildTrussView(model, result);
    expect(v.planar).toBe(true);
    expect(v.hasResult).toBe(true);
    expect(v.shapeChanged).toBe(false);
    expect(v.members.map((m) => [v.nodes[m.a]!.id, v.nodes[m.b]!.id])).toEqual([["A", "C"], ["B", "C"]]);
    expect(v.members[0]!.initialArea).toBe(400);
    expect(v.members[0]!.area).toBeCloseTo(106.383, 6);
    expect(v.members[0]!.force?.LC1).toBe(-25000);
    expect(v.nodes[0]!.fixed).toEqual(["x", "y"]);
  });

  it("agrees with the closed-form statics of the fixture (N = P / 2 sin θ, v = N L / (E A sin θ))", () => {
    const P = 30000, sin = 0.6, E = 210000, L = 2500;
    const N = P / (2 * sin);
    const A = N / 235;
    expect(result.members[0]!.force.LC1).toBeCloseTo(-N, 6);
    expect(result.members[0]!.area).toBeCloseTo(A, 3);
    const v = buildTrussView(model, result);
    expect(v.loadCases[0]!.maxDisplacement).toBeCloseTo((N * L) / (E * A * sin), 4);
    expect(v.loadCases[0]!.maxAbsForce).toBe(N);
    expect(v.loadCases[0]!.loads).toEqual([{ node: 2, f: [0, -30000, 0] }]);
  });

  it("moves the deformed shape by scale × displacement, and picks a nice magnification", () => {
    const v = buildTrussView(model, result);
    const k = defaultDeformationScale(v, 0);
    expect([1, 2, 5]).toContain(Number((k / Math.pow(10, Math.floor(Math.log10(k)))).toPrecision(3)));
    const moved = deformedPositions(v, 0, 100);
    expect(moved[2]![1]).toBeCloseTo(1500 - 466.268, 6);
    expect(moved[0]).toEqual([0, 0, 0]);
    expect(niceNumber(37)).toBe(20);
    expect(niceNumber(0.7)).toBe(0.5);
  });

  it("draws member radius with the square root of area, so drawn cross-sections scale with area", () => {
    const m2: ModelLike = { ...model, members: [{ ...model.members[0]!, area: 100 }, { ...model.members[1]!, area: 400 }] };
    const r = visualRadii(buildTrussView(m2));
    expect(r[1]! / r[0]!).toBeCloseTo(2, 9);
  });

  it("shows the initial geometry when a result moved nodes (shape optimization)", () => {
    const moved: ResultLike = { ...result, nodes: result.nodes.map((n) => (n.id === "C" ? { ...n, y: 1800 } : n)) };
    const v = buildTrussView(model, moved);
    expect(v.shapeChanged).toBe(true);
    expect(v.nodes[2]!.initial[1]).toBe(1500);
    expect(v.nodes[2]!.position[1]).toBe(1800);
  });

  it("tells planar from spatial trusses and finds the vertical from the loads", () => {
    const tower: ModelLike = {
      dimension: 3,
      nodes: [
        { id: "a", x: 0, y: 0, z: 0, fixed: ["x", "y", "z"] },
        { id: "b", x: 1, y: 0, z: 0, fixed: ["x", "y", "z"] },
        { id: "c", x: 0, y: 1, z: 0, fixed: ["x", "y", "z"] },
        { id: "d", x: 0.3, y: 0.3, z: 2 },
      ],
      members: ["a", "b", "c"].map((s) => ({ id: `${s}d`, start: s, end: "d", area: 1 })),
      loadCases: [{ id: "W", loads: [{ node: "d", fx: 1, fz: -10 }] }],
    };
    const v = buildTrussView(tower);
    expect(v.planar).toBe(false);
    expect(upAxis(v)).toBe("z");
    expect(boundsOf([[0, 0, 0], [3, 4, 0]]).span).toBe(5);
  });
});

describe("instancing", () => {
  it("maps the unit cylinder's end caps exactly onto the member's end nodes", () => {
    const m = new THREE.Matrix4();
    for (const [p, q] of [
      [[0, 0, 0], [2000, 1500, 0]],
      [[4000, 0, 0], [2000, 1500, 0]],
      [[1, 2, 3], [1, -5, 3]], // pointing down -y: the antiparallel case
      [[0, 0, 0], [0, 0, 7]],
    ] as [number, number, number][][]) {
      placeCylinder(m, p as [number, number, number], q as [number, number, number], 12);
      const bottom = new THREE.Vector3(0, -0.5, 0).applyMatrix4(m);
      const top = new THREE.Vector3(0, 0.5, 0).applyMatrix4(m);
      expect(bottom.distanceTo(new THREE.Vector3(...p))).toBeLessThan(1e-9 * (1 + Math.hypot(...p!)));
      expect(top.distanceTo(new THREE.Vector3(...q))).toBeLessThan(1e-9 * (1 + Math.hypot(...q!)));
      // a point on the rim stays at the drawn radius from the axis
      const rim = new THREE.Vector3(1, 0, 0).applyMatrix4(m);
      const mid = new THREE.Vector3(...p).add(new THREE.Vector3(...q)).multiplyScalar(0.5);
      expect(rim.distanceTo(mid)).toBeCloseTo(12, 9);
    }
  });

  it("points a support cone's tip at the node along the restrained axis", () => {
    const m = placeCone(new THREE.Matrix4(), [5, 6, 7], new THREE.Vector3(1, 0, 0), 3);
    expect(new THREE.Vector3(0, 0, 0).applyMatrix4(m).toArray()).toEqual([5, 6, 7]);
    const base = new THREE.Vector3(0, -1, 0).applyMatrix4(m);
    expect(base.x).toBeCloseTo(2, 12);
  });
});

describe("palette", () => {
  it("tells tension from compression and ignores numerical noise", () => {
    expect(forceSense(18100, 25000)).toBe("tension");
    expect(forceSense(-25000, 25000)).toBe("compression");
    expect(forceSense(1e-6, 25000)).toBe("idle");
  });

  it("uses colour tokens that app/app.css defines", () => {
    const css = fs.readFileSync(path.resolve(import.meta.dirname, "../../app/app.css"), "utf8");
    expect(css).toContain("--color-tension:");
    expect(css).toContain("--color-compression:");
  });
});

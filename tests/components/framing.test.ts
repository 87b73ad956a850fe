// "Fit to view": the framing math against three.js's own camera projection (the reference:
// three's PerspectiveCamera / OrthographicCamera turn world points into normalized device
// coordinates, -1..1 across the canvas). Every corner of the drawn box must land inside the
// margin and the tightest one on it, for the tall demo mast on a wide desktop canvas and on
// a phone, and for a wide roof likewise.
import fs from "node:fs";
import path from "node:path";
import * as THREE from "three";
import { describe, expect, it } from "vitest";
import { drawnBox, FIT_FILL, fitOrthographic, fitPerspective, loadArrows, supportSize, type Box } from "~/components/viewer/framing";
import { buildTrussView, upAxis, type ModelLike, type Vec3 } from "~/components/viewer/truss-view";

const demo = (name: string) => JSON.parse(fs.readFileSync(path.resolve(import.meta.dirname, "../../demo/models", name), "utf8")) as ModelLike;
const mast = buildTrussView(demo("halvard-point-relay-mast.truss.json"));
const roof = buildTrussView(demo("marrowfield-hall-roof.truss.json"));
const parts = { loadCase: 0, showLoads: true, showSupports: true, showDeformed: false, deformationScale: 1 };

// canvas sizes seen in the pages (CSS pixels): desktop job page, phone
const CANVASES = [
  { name: "desktop 1240×510", width: 1240, height: 510 },
  { name: "phone 358×410", width: 358, height: 410 },
];

const corners = (b: Box): Vec3[] => [b.min[0], b.max[0]].flatMap((x) => [b.min[1], b.max[1]].flatMap((y) => [b.min[2], b.max[2]].map((z): Vec3 => [x, y, z])));

/** Largest |x| and |y| of the box corners on screen, through three's projection. */
function extentOnScreen(camera: THREE.Camera, box: Box) {
  camera.updateMatrixWorld(true);
  let x = 0;
  let y = 0;
  for (const c of corners(box)) {
    const p = new THREE.Vector3(...c).project(camera);
    x = Math.max(x, Math.abs(p.x));
    y = Math.max(y, Math.abs(p.y));
    expect(p.z, "in front of the camera, inside near and far").toBeLessThan(1);
  }
  return { x, y };
}

function perspectiveOf(box: Box, view: typeof mast, canvas: { width: number; height: number }) {
  const up: Vec3 = upAxis(view) === "z" ? [0, 0, 1] : [0, 1, 0];
  const back: Vec3 = up[2] ? [0.9, -1.6, 0.8] : [0.9, 0.7, 1.6];
  const aspect = canvas.width / canvas.height;
  const fit = fitPerspective(box, { fovDeg: 40, aspect, back, up });
  const cam = new THREE.PerspectiveCamera(40, aspect, view.bounds.span / 1000, view.bounds.span * 100);
  cam.up.set(...up);
  cam.position.set(...fit.position);
  cam.lookAt(new THREE.Vector3(...fit.target));
  cam.updateProjectionMatrix();
  return { cam, fit };
}

describe("fit to view, perspective", () => {
  for (const [label, view] of [["tall mast", mast], ["wide roof", roof]] as const)
    for (const canvas of CANVASES)
      it(`keeps the ${label} inside the margin on a ${canvas.name} canvas, and no looser than needed`, () => {
        const box = drawnBox(view, parts);
        const { cam } = perspectiveOf(box, view, canvas);
        const e = extentOnScreen(cam, box);
        expect(Math.max(e.x, e.y)).toBeLessThanOrEqual(FIT_FILL + 1e-9);
        expect(Math.max(e.x, e.y)).toBeGreaterThan(FIT_FILL - 1e-6);
      });

  it("makes room for what is drawn past the nodes: the mast's load arrows and support cones", () => {
    // the mast's wind loads push the top nodes down and sideways, so the arrow shafts reach
    // above the top of the mast; the supports hang below its foot
    const nodesOnly: Box = { min: mast.bounds.min, max: mast.bounds.max };
    const box = drawnBox(mast, parts);
    expect(box.max[2]).toBeGreaterThan(nodesOnly.max[2]);
    expect(box.min[2]).toBeLessThanOrEqual(nodesOnly.min[2] - supportSize(mast) + 1e-9);
    const { cam } = perspectiveOf(box, mast, CANVASES[0]!);
    cam.updateMatrixWorld(true);
    for (const a of loadArrows(mast, 0)) {
      const tail = new THREE.Vector3(a.tip[0] - a.dir[0] * a.len, a.tip[1] - a.dir[1] * a.len, a.tip[2] - a.dir[2] * a.len).project(cam);
      expect(Math.abs(tail.y)).toBeLessThanOrEqual(FIT_FILL);
      expect(Math.abs(tail.x)).toBeLessThanOrEqual(FIT_FILL);
    }
    // without the loads and supports the box is the nodes' (plus the joint spheres)
    const bare = drawnBox(mast, { ...parts, showLoads: false, showSupports: false });
    expect(bare.max[2]).toBeLessThan(box.max[2]);
  });

  it("looks at the box centre from the requested side", () => {
    const box = drawnBox(mast, parts);
    const { fit } = perspectiveOf(box, mast, CANVASES[0]!);
    const d: Vec3 = [fit.position[0] - fit.target[0], fit.position[1] - fit.target[1], fit.position[2] - fit.target[2]];
    const b = new THREE.Vector3(0.9, -1.6, 0.8).normalize();
    expect(new THREE.Vector3(...d).normalize().dot(b)).toBeCloseTo(1, 12);
    expect(Math.hypot(...d)).toBeCloseTo(fit.distance, 9);
    expect(fit.target[2]).toBeCloseTo((box.min[2] + box.max[2]) / 2, 9);
  });
});

describe("fit to view, flat 2D", () => {
  for (const canvas of CANVASES)
    it(`fits the wide roof across a ${canvas.name} canvas with the margin`, () => {
      const box = drawnBox(roof, parts);
      const fit = fitOrthographic(box, canvas);
      // the frustum the scene's orthographic camera has: the canvas in CSS pixels
      const cam = new THREE.OrthographicCamera(-canvas.width / 2, canvas.width / 2, canvas.height / 2, -canvas.height / 2, -roof.bounds.span * 10, roof.bounds.span * 10);
      cam.zoom = fit.zoom;
      cam.position.set(fit.target[0], fit.target[1], fit.target[2] + roof.bounds.span);
      cam.lookAt(new THREE.Vector3(...fit.target));
      cam.updateProjectionMatrix();
      const e = extentOnScreen(cam, box);
      expect(Math.max(e.x, e.y)).toBeLessThanOrEqual(FIT_FILL + 1e-9);
      expect(Math.max(e.x, e.y)).toBeGreaterThan(FIT_FILL - 1e-6);
    });
});

// Where the camera goes for "Fit to view": the box of everything drawn (nodes, joints, load
// arrows, support cones, the deformed shape) must fit the canvas with a margin on every side,
// for the camera's field of view and the canvas's aspect ratio, whether the truss is tall
// (a mast on a wide screen) or wide (a roof on a phone). Plain numbers, no three.js, so the
// math is tested in node; the scene (TrussScene.tsx) applies the result.
import { deformedPositions, visualRadii, type TrussView, type Vec3 } from "./truss-view";
import { maxOf } from "~/engine/util/extent";

/** Share of the canvas half-width and half-height the framed box may fill; the rest is margin. */
export const FIT_FILL = 0.86;

export interface Box {
  min: Vec3;
  max: Vec3;
}

/** The longest load arrow: long enough to read, short against the truss and its members. */
export function loadArrowLength(view: TrussView): number {
  return Math.min(view.bounds.span * 0.09, view.medianLength * 0.7);
}

/** Height of a support cone. */
export function supportSize(view: TrussView): number {
  return Math.min(view.bounds.span * 0.035, view.medianLength * 0.3);
}

/** Radius of the joint spheres: a little thicker than the thickest member. */
export function jointRadius(view: TrussView): number {
  const radii = visualRadii(view);
  return (radii.length ? maxOf(radii) : view.bounds.span * 0.005) * 1.25;
}

export interface LoadArrow {
  tip: Vec3; // on the node
  dir: Vec3; // unit vector along the force
  len: number;
}

/** Arrows for nodal forces: heads on the nodes, length by magnitude (at least a quarter of the longest). */
function forceArrows(view: TrussView, forces: { node: number; f: Vec3 }[]): LoadArrow[] {
  const maxF = forces.reduce((m, l) => Math.max(m, Math.hypot(...l.f)), 0);
  if (!(maxF > 0)) return [];
  const longest = loadArrowLength(view);
  return forces
    .filter((l) => Math.hypot(...l.f) > 0)
    .map((l) => {
      const mag = Math.hypot(...l.f);
      return { tip: view.nodes[l.node]!.position, dir: [l.f[0] / mag, l.f[1] / mag, l.f[2] / mag] as Vec3, len: longest * Math.max(0.25, mag / maxF) };
    });
}

/** The arrows of one load case (or combination): the nodal loads as given. */
export function loadArrows(view: TrussView, loadCase: number): LoadArrow[] {
  return forceArrows(view, view.loadCases[loadCase]?.loads ?? []);
}

/**
 * The support reactions of one load case or combination, drawn like loads (head on the node,
 * along the force the support exerts on the truss), scaled among themselves.
 */
export function reactionArrows(view: TrussView, loadCase: number): LoadArrow[] {
  return forceArrows(view, view.loadCases[loadCase]?.reactions ?? []);
}

export interface DrawnParts {
  loadCase: number;
  showLoads: boolean;
  showReactions?: boolean;
  showSupports: boolean;
  showDeformed: boolean;
  deformationScale: number;
}

/** The box around everything the scene draws with these settings, not only the node positions. */
export function drawnBox(view: TrussView, parts: DrawnParts): Box {
  const min: Vec3 = [Infinity, Infinity, Infinity];
  const max: Vec3 = [-Infinity, -Infinity, -Infinity];
  const add = (p: Vec3, pad = 0) => {
    for (let k = 0; k < 3; k++) {
      min[k] = Math.min(min[k]!, p[k]! - pad);
      max[k] = Math.max(max[k]!, p[k]! + pad);
    }
  };
  const joint = jointRadius(view);
  for (const n of view.nodes) {
    add(n.position, joint);
    add(n.initial);
  }
  if (parts.showSupports) {
    const s = supportSize(view);
    for (const n of view.nodes) if (n.fixed.length) add(n.position, s);
  }
  const arrows = [...(parts.showLoads ? loadArrows(view, parts.loadCase) : []), ...(parts.showReactions ? reactionArrows(view, parts.loadCase) : [])];
  if (arrows.length)
    for (const a of arrows) {
      const head = a.len * 0.14; // the cone's half-width
      add([a.tip[0] - a.dir[0] * a.len, a.tip[1] - a.dir[1] * a.len, a.tip[2] - a.dir[2] * a.len], head);
      add(a.tip, head);
    }
  if (parts.showDeformed && view.hasResult) for (const p of deformedPositions(view, parts.loadCase, parts.deformationScale)) add(p);
  if (!Number.isFinite(min[0])) return { min: [0, 0, 0], max: [0, 0, 0] };
  return { min, max };
}

const sub = (a: Vec3, b: Vec3): Vec3 => [a[0] - b[0], a[1] - b[1], a[2] - b[2]];
const dot = (a: Vec3, b: Vec3) => a[0] * b[0] + a[1] * b[1] + a[2] * b[2];
const cross = (a: Vec3, b: Vec3): Vec3 => [a[1] * b[2] - a[2] * b[1], a[2] * b[0] - a[0] * b[2], a[0] * b[1] - a[1] * b[0]];
const unit = (a: Vec3): Vec3 => {
  const l = Math.hypot(...a) || 1;
  return [a[0] / l, a[1] / l, a[2] / l];
};
const centreOf = (b: Box): Vec3 => [(b.min[0] + b.max[0]) / 2, (b.min[1] + b.max[1]) / 2, (b.min[2] + b.max[2]) / 2];
const corners = (b: Box): Vec3[] => [b.min[0], b.max[0]].flatMap((x) => [b.min[1], b.max[1]].flatMap((y) => [b.min[2], b.max[2]].map((z): Vec3 => [x, y, z])));

export interface PerspectiveFit {
  target: Vec3;
  position: Vec3;
  distance: number;
}

/**
 * The nearest camera position, looking at the box centre from direction `back` (from the
 * target towards the camera) with `up` up, at which every corner of the box projects inside
 * `fill` of the half-width and half-height. A corner d (from the centre) sits at depth
 * D - d·back in front of the camera, so it fits when |d·right| <= fill·tan(fov/2)·aspect·depth
 * and |d·up'| <= fill·tan(fov/2)·depth; the box is convex, so its corners fitting is enough.
 */
export function fitPerspective(box: Box, o: { fovDeg: number; aspect: number; back: Vec3; up: Vec3; fill?: number }): PerspectiveFit {
  const fill = o.fill ?? FIT_FILL;
  const back = unit(o.back);
  const right = unit(cross(o.up, back));
  const upCam = cross(back, right);
  const tanV = Math.tan((o.fovDeg * Math.PI) / 360) * fill;
  const tanH = tanV * (o.aspect > 0 ? o.aspect : 1);
  const target = centreOf(box);
  const size = Math.hypot(...sub(box.max, box.min)) || 1;
  let distance = size * 0.05;
  for (const c of corners(box)) {
    const d = sub(c, target);
    const along = dot(d, back);
    // in front of the camera by a little at least, then inside both half-angles
    distance = Math.max(distance, along + size * 0.01, along + Math.abs(dot(d, right)) / tanH, along + Math.abs(dot(d, upCam)) / tanV);
  }
  return { target, distance, position: [target[0] + back[0] * distance, target[1] + back[1] * distance, target[2] + back[2] * distance] };
}

/**
 * The zoom of an orthographic camera looking down -z whose frustum spans the canvas in CSS
 * pixels (one world unit = one pixel at zoom 1), so that the box's x-y extent fills `fill`
 * of the narrower direction.
 */
export function fitOrthographic(box: Box, o: { width: number; height: number; fill?: number }): { target: Vec3; zoom: number } {
  const fill = o.fill ?? FIT_FILL;
  const size = Math.hypot(...sub(box.max, box.min)) || 1;
  const w = Math.max(box.max[0] - box.min[0], size * 0.05);
  const h = Math.max(box.max[1] - box.min[1], size * 0.05);
  return { target: centreOf(box), zoom: fill * Math.min(o.width / w, o.height / h) };
}

// Instance transforms of the viewer's unit shapes. The member shape is a cylinder of radius 1
// and height 1 centred on the origin along +y; its matrix scales it to the member's drawn
// radius and length, turns +y onto the member axis and moves its centre to the midpoint.
import * as THREE from "three";
import type { Vec3 } from "./truss-view";

export const Y_AXIS = new THREE.Vector3(0, 1, 0);

/**
 * An instanced mesh in the scene's one lit material, each instance coloured through its own
 * instance colour (`colour` for all of them, when given). Members, joints, supports and arrows
 * then share one shader program: a browser drawing without a GPU (software GL) compiles each
 * program on the first frame, which was most of that frame's cost there.
 */
export function litInstances(geometry: THREE.BufferGeometry, count: number, colour?: THREE.Color): THREE.InstancedMesh {
  const mesh = new THREE.InstancedMesh(geometry, new THREE.MeshLambertMaterial({ color: 0xffffff }), Math.max(1, count));
  mesh.count = count;
  if (colour) for (let i = 0; i < Math.max(1, count); i++) mesh.setColorAt(i, colour);
  return mesh;
}

const a = new THREE.Vector3();
const b = new THREE.Vector3();
const dir = new THREE.Vector3();
const mid = new THREE.Vector3();
const scale = new THREE.Vector3();
const rot = new THREE.Quaternion();

export function placeCylinder(target: THREE.Matrix4, p: Vec3, q: Vec3, radius: number): THREE.Matrix4 {
  a.set(p[0], p[1], p[2]);
  b.set(q[0], q[1], q[2]);
  dir.subVectors(b, a);
  const length = dir.length();
  if (length > 0) dir.divideScalar(length);
  else dir.copy(Y_AXIS);
  // setFromUnitVectors handles the antiparallel case (a member pointing down -y) itself
  rot.setFromUnitVectors(Y_AXIS, dir);
  mid.addVectors(a, b).multiplyScalar(0.5);
  scale.set(radius, length || 1e-9, radius);
  return target.compose(mid, rot, scale);
}

/** A cone of height 1 with its tip at the origin pointing along +y, turned to point along `axis`. */
export function placeCone(target: THREE.Matrix4, at: Vec3, axis: THREE.Vector3, size: number): THREE.Matrix4 {
  rot.setFromUnitVectors(Y_AXIS, axis);
  mid.set(at[0], at[1], at[2]);
  scale.set(size, size, size);
  return target.compose(mid, rot, scale);
}

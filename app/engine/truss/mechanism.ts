// Turning a zero-energy mode of the stiffness matrix into a sentence an engineer can act on.
import { Matrix, solve } from "ml-matrix";
import { AXIS_NAMES, type Structure } from "./structure";

export interface MechanismInfo {
  /** the node that moves most in the mode */
  node: string;
  /** its main direction of motion */
  axis: "x" | "y" | "z";
  /** every node that takes part in the motion */
  nodes: string[];
  kind: "free-node" | "rigid-translation" | "rigid-motion" | "local-mechanism";
  message: string;
}

export class MechanismError extends Error {
  readonly node: string;
  readonly axis: "x" | "y" | "z";
  readonly nodes: string[];
  readonly mechanisms: MechanismInfo[];
  constructor(mechanisms: MechanismInfo[]) {
    const m = mechanisms[0];
    const more = mechanisms.length > 1 ? ` (and ${mechanisms.length - 1} more mechanism${mechanisms.length > 2 ? "s" : ""})` : "";
    super(m.message + more);
    this.name = "MechanismError";
    this.node = m.node;
    this.axis = m.axis;
    this.nodes = m.nodes;
    this.mechanisms = mechanisms;
  }
}

export function listNames(names: string[], max = 5): string {
  const shown = names.slice(0, max);
  const rest = names.length - shown.length;
  if (rest > 0) return `${shown.join(", ")} and ${rest} more`;
  if (shown.length <= 1) return shown.join("");
  return `${shown.slice(0, -1).join(", ")} and ${shown[shown.length - 1]}`;
}

/** Describes a zero-energy mode given as a full vector (nNodes*3). */
export function describeMode(s: Structure, mode: Float64Array): MechanismInfo {
  const nNodes = s.nodeIds.length;
  let best = -1;
  let bestMag = 0;
  const mag = new Float64Array(nNodes);
  for (let i = 0; i < nNodes; i++) {
    const x = mode[3 * i];
    const y = mode[3 * i + 1];
    const z = mode[3 * i + 2];
    mag[i] = Math.sqrt(x * x + y * y + z * z);
    if (mag[i] > bestMag) {
      bestMag = mag[i];
      best = i;
    }
  }
  if (best < 0) throw new Error("describeMode: empty mode");
  const involved: number[] = [];
  for (let i = 0; i < nNodes; i++) if (mag[i] > 1e-3 * bestMag) involved.push(i);
  involved.sort((a, b) => mag[b] - mag[a]);
  const comps = [0, 1, 2].map((a) => Math.abs(mode[3 * best + a]));
  const axisIdx = comps.indexOf(Math.max(...comps));
  const axis = AXIS_NAMES[axisIdx];
  const pure = comps[axisIdx] >= 0.95 * bestMag;
  const dir = pure ? `in ${axis}` : `in the direction (${[0, 1, 2].slice(0, s.dim).map((a) => round(mode[3 * best + a] / bestMag)).join(", ")})`;
  const node = s.nodeIds[best];
  const names = involved.map((i) => s.nodeIds[i]);

  if (involved.length === 1) {
    return {
      node, axis, nodes: names, kind: "free-node",
      message: `node ${node} can move freely ${dir}: add a support or a member that holds it ${pure ? `in ${axis}` : "in that direction"}`,
    };
  }
  // a translation: every involved node moves by the same vector
  let translation = true;
  for (const i of involved) {
    for (let a = 0; a < 3; a++) if (Math.abs(mode[3 * i + a] - mode[3 * best + a]) > 1e-6 * bestMag) translation = false;
  }
  // the whole structure moves as a rigid body (supports included, standing still or not)
  const wholeStructure = isRigidMotion(s, mode, bestMag);
  if (translation && wholeStructure) {
    return {
      node, axis, nodes: names, kind: "rigid-translation",
      message: `the structure is not supported ${dir}: all its nodes can slide together; restrain at least one node ${pure ? `in ${axis}` : "in that direction"}`,
    };
  }
  if (wholeStructure) {
    return {
      node, axis, nodes: names, kind: "rigid-motion",
      message: `the supports do not hold the structure: it can turn as a rigid body (node ${node} moves ${dir}); add or rearrange supports`,
    };
  }
  const how = translation ? `can move together ${dir} without straining any member` : `can move without straining any member (node ${node} moves most, ${dir})`;
  return {
    node, axis, nodes: names, kind: "local-mechanism",
    message: `nodes ${listNames(names)} ${how}: the truss is a mechanism there; add a member (bracing) or a support`,
  };
}

function round(v: number): string {
  const r = Math.round(v * 100) / 100;
  return String(Object.is(r, -0) ? 0 : r);
}

/**
 * Whether the motion of all connected nodes is u = t + w x r (least-squares fit of t and w,
 * 6 unknowns, solved densely; a small problem whatever the model size).
 */
function isRigidMotion(s: Structure, mode: Float64Array, scale: number): boolean {
  const A = new Matrix(6, 6);
  const b = new Array<number>(6).fill(0);
  const rows: number[][] = [];
  const rhs: number[] = [];
  // about the centroid, so that the fit is well conditioned whatever the length unit
  const o = [0, 0, 0];
  let count = 0;
  for (let i = 0; i < s.nodeIds.length; i++) {
    if (!s.connected[i]) continue;
    for (let a = 0; a < 3; a++) o[a] += s.coords[3 * i + a];
    count++;
  }
  for (let a = 0; a < 3; a++) o[a] /= Math.max(count, 1);
  for (let i = 0; i < s.nodeIds.length; i++) {
    if (!s.connected[i]) continue;
    const x = s.coords[3 * i] - o[0], y = s.coords[3 * i + 1] - o[1], z = s.coords[3 * i + 2] - o[2];
    // rows of [I, -[r]x] for t and w
    const block = [
      [1, 0, 0, 0, z, -y],
      [0, 1, 0, -z, 0, x],
      [0, 0, 1, y, -x, 0],
    ];
    for (let a = 0; a < 3; a++) {
      if (s.dim === 2 && a === 2) continue;
      rows.push(block[a]);
      rhs.push(mode[3 * i + a]);
    }
  }
  for (let r = 0; r < rows.length; r++) {
    for (let p = 0; p < 6; p++) {
      b[p] += rows[r][p] * rhs[r];
      for (let q = 0; q < 6; q++) A.set(p, q, A.get(p, q) + rows[r][p] * rows[r][q]);
    }
  }
  const c = solve(A, Matrix.columnVector(b), true).to1DArray();
  let worst = 0;
  for (let r = 0; r < rows.length; r++) {
    let v = -rhs[r];
    for (let p = 0; p < 6; p++) v += rows[r][p] * c[p];
    worst = Math.max(worst, Math.abs(v));
  }
  return worst <= 1e-6 * scale;
}

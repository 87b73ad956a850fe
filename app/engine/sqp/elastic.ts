// The elastic subproblem's Hessian: B extended by the relaxation variable.
import type { QpHessian } from "./dual-qp";
import { type HessianApprox, type ReducedInverse, dot } from "./hessian";
import { ELASTIC_WEIGHT } from "./thresholds";

/**
 * B extended by the elastic variable at index n, with curvature ELASTIC_WEIGHT times a size
 * estimate of B (|B v| for v = ones/sqrt(n)), so that relaxing stays expensive next to moving
 * even after B has grown large.
 */
export function elasticHessian(B: HessianApprox, n: number): QpHessian {
  const v1 = new Float64Array(n).fill(1 / Math.sqrt(n));
  const bv = new Float64Array(n);
  B.applyB(v1, bv);
  const weight = ELASTIC_WEIGHT * Math.max(1, Math.sqrt(dot(bv, bv)));
  return {
    applyB(v, out) {
      const o = new Float64Array(n);
      B.applyB(v.subarray(0, n), o);
      out.set(o);
      out[n] = weight * v[n];
    },
    applyBRows: B.applyBRows
      ? (v, rows, count, out) => {
          // the relaxation variable's row is its own: the inner matrix gets the others
          let inner = count;
          if (count > 0 && rows[count - 1] === n) {
            inner = count - 1;
            out[n] = weight * v[n];
          }
          B.applyBRows!(v, rows, inner, out);
        }
      : undefined,
    reduced(): ReducedInverse {
      const inner = B.reduced();
      let fixedXi = false;
      const o = new Float64Array(n);
      return {
        apply(v, out) {
          inner.apply(v.subarray(0, n), o);
          out.set(o);
          out[n] = fixedXi ? 0 : v[n] / weight;
        },
        fix(j) {
          if (j === n) fixedXi = true;
          else inner.fix(j);
        },
        free(j) {
          if (j === n) fixedXi = false;
          else inner.free(j);
        },
        fixMany(js) {
          if (js.includes(n)) fixedXi = true;
          const rest = js.filter((j) => j !== n);
          if (inner.fixMany) inner.fixMany(rest);
          else for (const j of rest) inner.fix(j);
        },
      };
    },
  };
}


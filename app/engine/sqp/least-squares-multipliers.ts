// First multiplier guess: least squares on stationarity, min ||g + A' lambda||, for the rows
// active at the start point, via the normal equations A A' lambda = -A g built row by row
// into a growing Cholesky factor; a row dependent on earlier ones gets multiplier 0.
import { GrowingCholesky } from "./growing-cholesky";
import { type QpRow, rowDot } from "./rows";

export function leastSquaresMultipliers(g: Float64Array, rows: QpRow[], n: number): Float64Array {
  const chol = new GrowingCholesky();
  const kept: number[] = [];
  const lam = new Float64Array(rows.length);
  const dense = rows.map((r) => {
    const v = new Float64Array(n);
    if (r.idx === null) v.set(r.val);
    else for (let k = 0; k < r.idx.length; k++) v[r.idx[k]] += r.val[k];
    return v;
  });
  for (let i = 0; i < rows.length; i++) {
    const w = new Float64Array(kept.length);
    for (let k = 0; k < kept.length; k++) w[k] = rowDot(rows[kept[k]], dense[i], n);
    const y = chol.forward(w);
    const aa = rowDot(rows[i], dense[i], n);
    let yy = 0;
    for (let k = 0; k < y.length; k++) yy += y[k] * y[k];
    const d2 = aa - yy;
    if (d2 > 1e-10 * aa && aa > 0) {
      chol.append(y, Math.sqrt(d2));
      kept.push(i);
    }
  }
  const rhs = new Float64Array(kept.length);
  for (let k = 0; k < kept.length; k++) rhs[k] = -rowDot(rows[kept[k]], g, n);
  const sol = chol.solve(rhs);
  for (let k = 0; k < kept.length; k++) lam[kept[k]] = sol[k];
  return lam;
}

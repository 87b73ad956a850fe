#!/usr/bin/env python3
"""Reference solve of a truss design problem (sizing and shape) with scipy.optimize SLSQP.

Reads one JSON problem on stdin, or {"problems": [...]} (written by
tests/engine/design/slsqp-design-reference.ts), and prints one JSON line per problem: x
(scaled), f (model units), nit, success, message, seconds, maxViolation.

The model is rebuilt here from plain arrays with numpy alone (direct stiffness analysis); only
the problem statement is shared with the Strutwise engine, not its code:
  variables   z: areas A = scale * z (one per area variable), shape values s = scale * z moving
              node coordinates: coord = coord0 + sum(c * z) over the (dof, c) pairs of a variable
  objective   mass sum(rho A L) / f0
  limits      stress        sign * sigma / limit - 1 <= 0          (sigma = E (n . du) / L)
              buckling      (-sigma - sigma_E) / limit <= 0,  sigma_E = pi^2 E a A^(b-1) / (k L)^2
                            (the stress difference over a reference stress: the same zero set
                            as the Euler ratio -sigma / sigma_E <= 1)
              displacement  sign * u / limit - 1 <= 0
              length        1 - L / limit <= 0
Gradients: by area through the adjoint method (one solve per limit with the factor of K); by
shape variable by the complex step (Squire & Trapp 1998: f'(x) = Im f(x + ih) / h, exact to
rounding), i.e. one complex analysis per shape variable.
"""
import json
import sys
import time

import numpy as np
from scipy.linalg import cho_factor, cho_solve, lu_factor, lu_solve
from scipy.optimize import minimize


def main():
    data = json.load(sys.stdin)
    # one problem, or {"problems": [...]}: one line each, in order (one start-up of scipy for all)
    for P in data["problems"] if "problems" in data else [data]:
        solve(P)
        sys.stdout.flush()


def solve(P):
    coords0 = np.array(P["coords"], dtype=float)
    ndof = coords0.size
    fixed = np.zeros(ndof, dtype=bool)
    fixed[P["fixed"]] = True
    free = np.flatnonzero(~fixed)
    start = np.array(P["start"]); end = np.array(P["end"])
    m = len(start)
    E = np.array(P["E"], dtype=float); rho = np.array(P["density"], dtype=float)
    loads = np.array(P["loads"], dtype=float)  # (cases, ndof)
    var = np.array(P["areaVar"]); ascale = np.array(P["areaScale"], dtype=float)
    na = len(ascale)
    shape = P["shape"]  # per shape variable: list of [dof, c]
    ns = len(shape)
    nv = na + ns
    edofs = np.hstack([3 * start[:, None] + np.arange(3), 3 * end[:, None] + np.arange(3)])
    bk = P.get("buckling")
    if bk:
        ba, bb = bk["a"], bk["b"]
        bkk = np.array(bk["k"], dtype=float)
    limits = P["limits"]
    kinds = [l["kind"] for l in limits]
    f0 = P["f0"]

    def geometry(z):
        c = coords0.astype(z.dtype).copy()
        for v, moves in enumerate(shape):
            for dof, coef in moves:
                c[dof] = c[dof] + coef * z[na + v]
        xyz = c.reshape(-1, 3)
        d = xyz[end] - xyz[start]
        L = np.sqrt(np.sum(d * d, axis=1))  # complex-safe (no abs)
        return d, L

    def analyse(z):
        d, L = geometry(z)
        A = ascale[var] * z[var]
        n = d / L[:, None]
        B = np.hstack([-n, n])
        k = E * A / L
        K = np.zeros((ndof, ndof), dtype=z.dtype)
        np.add.at(K, (edofs[:, :, None], edofs[:, None, :]), k[:, None, None] * (B[:, :, None] * B[:, None, :]))
        Kf = K[np.ix_(free, free)]
        U = np.zeros((loads.shape[0], ndof), dtype=z.dtype)
        if np.iscomplexobj(z):
            fac = lu_factor(Kf)
            U[:, free] = lu_solve(fac, loads[:, free].T.astype(z.dtype)).T
        else:
            fac = cho_factor(Kf)
            U[:, free] = cho_solve(fac, loads[:, free].T).T
        return d, L, A, B, U, fac

    # the limits as arrays, by kind
    kind = np.array(kinds)
    mem = np.array([l["member"] for l in limits], dtype=int)
    dofl = np.array([l["dof"] for l in limits], dtype=int)
    sgn = np.array([l["sign"] for l in limits], dtype=float)
    lc = np.array([l["loadCase"] for l in limits], dtype=int)
    lim = np.array([l["limit"] for l in limits], dtype=float)
    is_stress = (kind == "stress-tension") | (kind == "stress-compression")
    is_buck = kind == "buckling"
    is_member = is_stress | is_buck
    is_disp = kind == "displacement"
    is_len = kind == "length"
    is_vol = kind == "volume"
    known = is_member | is_disp | is_len | is_vol
    if not known.all():
        raise ValueError(f"unknown limit kinds {set(kind[~known])}")
    rm, rd, rl, rv = (np.flatnonzero(x) for x in (is_member, is_disp, is_len, is_vol))
    em, lcm = mem[rm], np.maximum(lc[rm], 0)

    def values(z, an=None):
        d, L, A, B, U, _ = an if an is not None else analyse(z)
        out = np.zeros(len(limits), dtype=z.dtype)
        sig = E[em] / L[em] * np.einsum("ij,ij->i", B[em], U[lcm[:, None], edofs[em]])
        stress = np.where(is_stress[rm], sgn[rm] * sig / lim[rm] - 1, 0)
        if bk:
            sigE = np.pi ** 2 * E[em] * ba * A[em] ** (bb - 1) / (bkk[em] * L[em]) ** 2
            stress = np.where(is_buck[rm], (-sig - sigE) / lim[rm], stress)
        out[rm] = stress
        out[rd] = sgn[rd] * U[lc[rd], dofl[rd]] / lim[rd] - 1
        out[rl] = 1 - L[mem[rl]] / lim[rl]
        out[rv] = np.dot(A, L) / lim[rv] - 1
        return out

    def mass(z):
        _, L = geometry(z)
        return np.dot(rho * ascale[var] * z[var], L)

    cache = {}

    def evaluate(z):
        key = z.tobytes()
        if key in cache:
            return cache[key]
        an = analyse(z)
        d, L, A, B, U, fac = an
        g = values(z, an)
        # area gradients by the adjoint method: one block solve for every row's d g / d u
        nl = len(limits)
        C = np.zeros((nl, ndof))
        w = (E[em] / L[em])[:, None] * B[em] / lim[rm][:, None]  # d sigma / d u_e over the limit
        w = np.where(is_buck[rm][:, None], -w, sgn[rm][:, None] * w)
        np.add.at(C, (rm[:, None], edofs[em]), w)
        C[rd, dofl[rd]] = sgn[rd] / lim[rd]
        lam = np.zeros((nl, ndof))
        lam[:, free] = cho_solve(fac, C[:, free].T).T
        BL = np.einsum("mk,rmk->rm", B, lam[:, edofs])  # (rows, members)
        BU = np.einsum("mk,cmk->cm", B, U[:, edofs])  # (cases, members)
        dA = -(E / L)[None, :] * BL * BU[np.maximum(lc, 0)]
        if bk:
            rb = np.flatnonzero(is_buck)
            eb = mem[rb]
            dA[rb, eb] -= np.pi ** 2 * E[eb] * ba * (bb - 1) * A[eb] ** (bb - 2) / (bkk[eb] * L[eb]) ** 2 / lim[rb]
        dA[rv] = L[None, :] / lim[rv][:, None]
        dA[rl] = 0
        J = np.zeros((nl, nv))
        Jarea = np.zeros((nl, na))
        np.add.at(Jarea.T, var, (dA * ascale[var][None, :]).T)
        J[:, :na] = Jarea
        # shape gradients by the complex step
        h = 1e-30
        for v in range(ns):
            zc = z.astype(complex)
            zc[na + v] += 1j * h
            J[:, na + v] = values(zc).imag / h
        cache.clear()
        cache[key] = (g, J)
        return g, J

    def fun(z):
        return float(mass(z) / f0)

    def grad(z):
        g = np.zeros(nv)
        _, L = geometry(z)
        np.add.at(g, var, rho * L * ascale[var])
        for v in range(ns):
            zc = z.astype(complex)
            zc[na + v] += 1j * 1e-30
            g[na + v] = mass(zc).imag / 1e-30
        return g / f0

    x0 = np.array(P["x0"], dtype=float)
    bounds = list(zip(P["lower"], P["upper"]))
    cons = [{"type": "ineq", "fun": lambda z: -evaluate(z)[0], "jac": lambda z: -evaluate(z)[1]}]
    t = time.perf_counter()
    r = minimize(fun, x0, jac=grad, bounds=bounds, constraints=cons, method="SLSQP",
                 options={"maxiter": P.get("maxiter", 1000), "ftol": P.get("ftol", 1e-10)})
    secs = time.perf_counter() - t
    worst = float(np.max(evaluate(r.x)[0])) if limits else 0.0
    print(json.dumps({"x": r.x.tolist(), "f": float(r.fun * f0), "nit": int(r.nit), "success": bool(r.success),
                      "message": str(r.message), "seconds": secs, "maxViolation": max(0.0, worst)}))


if __name__ == "__main__":
    main()

#!/usr/bin/env python3
"""Reference solve of a truss sizing problem with scipy.optimize SLSQP.

Reads one JSON problem on stdin (written by tests/engine/design/slsqp-reference.ts), solves it
with the same analytic formulas the Strutwise design engine uses (direct stiffness analysis,
adjoint gradients, limits as ratios g <= 0, areas scaled by A_ref, objective divided by f0)
and prints one JSON line: x (scaled), f (model units), nit, nfev, njev, success, message, seconds
(the solve, after the imports), peakKiB (the process's peak resident memory), cpuSeconds (the
process's CPU time, imports included).

Optional "starts" (a list of scaled starting designs): SLSQP runs from each one after the
other, as a scipy user would to get a several-starts answer; the lowest objective of the runs
that report success is printed, with nit, nfev and njev summed over the runs, seconds the whole
loop, "starts" their number and "reachedBest" how many ended within 1e-4 of the best.

Own weight and combinations (optional fields): case l carries the load P_l + s_l W(A), W the
own weight at factor 1 (half of each member's weight g rho A L on each end node, along minus
the gravity axis); a combination's displacements are the factored sum of the cases'. A limit's
"loadCase" indexes the responses: load cases, then combinations. The adjoint gradient of a
limit on response r then gains lambda^T s_r dW/dA, s_r the response's own-weight factor.
"""
import json
import resource
import sys
import time

import numpy as np
from scipy.linalg import cho_factor, cho_solve
from scipy.optimize import minimize


def main():
    P = json.load(sys.stdin)
    coords = np.array(P["coords"], dtype=float).reshape(-1, 3)
    nn = coords.shape[0]
    fixed = np.zeros(nn * 3, dtype=bool)
    fixed[P["fixed"]] = True
    free = np.flatnonzero(~fixed)
    start = np.array(P["start"]); end = np.array(P["end"])
    E = np.array(P["E"], dtype=float); rho = np.array(P["density"], dtype=float)
    loads = [np.array(f, dtype=float) for f in P["loads"]]
    var = np.array(P["areaVar"]); scale = np.array(P["scale"], dtype=float)
    nv = len(scale)
    d = coords[end] - coords[start]
    L = np.linalg.norm(d, axis=1)
    n_ = d / L[:, None]
    m = len(L)
    # element dof map (6 per member) and unit element blocks n n^T
    edofs = np.hstack([3 * start[:, None] + np.arange(3), 3 * end[:, None] + np.arange(3)])
    B = np.hstack([-n_, n_])  # elongation = B . u_e
    pos = -np.ones(nn * 3, dtype=int); pos[free] = np.arange(len(free))
    limits = P["limits"]
    nlc = len(loads)
    self_weight = np.array(P.get("selfWeight", [0.0] * nlc), dtype=float)
    combos = [np.array(c, dtype=float) for c in P.get("combinations", [])]
    factors = [np.eye(nlc)[l] for l in range(nlc)] + combos  # case factors of every response
    sw_resp = [float(np.dot(c, self_weight)) for c in factors]
    gdof = P.get("gravityAxis", 1)
    wpm = P.get("weightPerMass", 0.0)
    # dW/dA_e as a dense (m x ndof) matrix: -1/2 g rho L at both ends' gravity dofs
    dW = np.zeros((m, nn * 3))
    dW[np.arange(m), 3 * start + gdof] -= 0.5 * wpm * rho * L
    dW[np.arange(m), 3 * end + gdof] -= 0.5 * wpm * rho * L
    f0 = P["f0"]
    objective = P["objective"]
    cache = {}

    def analysis(x):
        key = x.tobytes()
        if key in cache:
            return cache[key]
        A = scale[var] * x[var]
        k = (E * A / L)
        K = np.zeros((nn * 3, nn * 3))
        blocks = k[:, None, None] * (B[:, :, None] * B[:, None, :])
        np.add.at(K, (edofs[:, :, None], edofs[:, None, :]), blocks)
        Kf = K[np.ix_(free, free)]
        c = cho_factor(Kf)
        W = A @ dW  # own weight at factor 1 (linear in A)
        U = []
        for l, f in enumerate(loads):
            fl = f + self_weight[l] * W
            u = np.zeros(nn * 3); u[free] = cho_solve(c, fl[free]); U.append(u)
        U = U + [sum(cf[l] * U[l] for l in range(nlc)) for cf in combos]
        cache.clear()
        cache[key] = (A, c, U)
        return cache[key]

    def response_rows(x):
        A, c, U = analysis(x)
        vals = []; grads = []
        for lim in limits:
            kind = lim["kind"]
            if kind == "volume":
                vals.append(np.dot(A, L) / lim["limit"] - 1)
                g = np.zeros(nv); np.add.at(g, var, L * scale[var] / lim["limit"]); grads.append(g)
                continue
            u = U[lim["loadCase"]]
            cvec = np.zeros(nn * 3)
            if kind == "displacement":
                val = lim["sign"] * u[lim["dof"]] / lim["limit"] - 1
                cvec[lim["dof"]] = lim["sign"] / lim["limit"]
            else:  # stress-tension / stress-compression
                e = lim["member"]
                sig = E[e] / L[e] * np.dot(B[e], u[edofs[e]])
                val = lim["sign"] * sig / lim["limit"] - 1
                cvec[edofs[e]] = lim["sign"] * E[e] / L[e] * B[e] / lim["limit"]
            lam = np.zeros(nn * 3); lam[free] = cho_solve(c, cvec[free])
            # dg/dA_e = -lambda_e^T (k_e / A_e) u_e
            de = -(E / L) * np.einsum("ij,ij->i", B, lam[edofs]) * np.einsum("ij,ij->i", B, u[edofs])
            de = de + sw_resp[lim["loadCase"]] * (dW @ lam)  # the load's share: lambda^T s_r dW/dA
            g = np.zeros(nv); np.add.at(g, var, de * scale[var]); grads.append(g)
            vals.append(val)
        return np.array(vals), np.array(grads)

    def fun(x):
        A, c, U = analysis(x)
        if objective == "mass":
            return float(np.dot(rho * A, L) / f0)
        W = A @ dW
        return float(sum(np.dot(f + self_weight[l] * W, U[l]) for l, f in enumerate(loads)) / f0)

    def grad(x):
        A, c, U = analysis(x)
        g = np.zeros(nv)
        if objective == "mass":
            np.add.at(g, var, rho * L * scale[var])
        else:
            for l in range(nlc):
                u = U[l]
                de = -(E / L) * np.einsum("ij,ij->i", B, u[edofs]) ** 2 + 2 * self_weight[l] * (dW @ u)
                np.add.at(g, var, de * scale[var])
        return g / f0

    x0 = np.array(P["x0"], dtype=float)
    starts = [np.array(z, dtype=float) for z in P["starts"]] if P.get("starts") else [x0]
    bounds = list(zip(P["lower"], P["upper"]))
    cons = [{"type": "ineq", "fun": lambda x: -response_rows(x)[0], "jac": lambda x: -response_rows(x)[1]}] if limits else []
    # optional wall-time cap: the iteration callback stops the run and the figures so far are
    # printed (iterations done, their time), so a benchmark can compare the cost per iteration
    max_seconds = P.get("maxSeconds")
    done = {"nit": 0, "x": x0}

    class TimeUp(Exception):
        pass

    def callback(xk):
        done["nit"] += 1
        done["x"] = xk
        if max_seconds is not None and time.perf_counter() - t > max_seconds:
            raise TimeUp()

    t = time.perf_counter()
    runs = []
    for start in starts:
        try:
            runs.append(minimize(fun, start, jac=grad, bounds=bounds, constraints=cons, method="SLSQP", callback=callback,
                                 options={"maxiter": P.get("maxiter", 500), "ftol": P.get("ftol", 1e-10)}))
        except TimeUp:
            secs = time.perf_counter() - t
            print(json.dumps({"x": list(map(float, done["x"])), "f": float(fun(done["x"]) * f0), "nit": done["nit"], "nfev": -1,
                              "njev": -1, "success": False, "message": f"stopped at the {max_seconds} s cap", "seconds": secs, "capped": True,
                              "starts": len(starts), "peakKiB": peak_kib(), "cpuSeconds": cpu_seconds()}))
            return
    secs = time.perf_counter() - t
    good = [r for r in runs if r.success]
    r = min(good, key=lambda q: q.fun) if good else runs[0]
    reached = sum(1 for q in good if abs(q.fun - r.fun) <= 1e-4 * abs(r.fun))
    print(json.dumps({"x": r.x.tolist(), "f": float(r.fun * f0), "nit": sum(int(q.nit) for q in runs), "nfev": sum(int(q.nfev) for q in runs),
                      "njev": sum(int(q.njev) for q in runs), "success": bool(r.success), "message": str(r.message), "seconds": secs,
                      "starts": len(starts), "reachedBest": reached, "peakKiB": peak_kib(), "cpuSeconds": cpu_seconds()}))


def peak_kib():
    """The process's peak resident memory in KiB (Linux reports ru_maxrss in KiB)."""
    return resource.getrusage(resource.RUSAGE_SELF).ru_maxrss


def cpu_seconds():
    """CPU time the process used so far (user and system), its imports included."""
    r = resource.getrusage(resource.RUSAGE_SELF)
    return r.ru_utime + r.ru_stime


if __name__ == "__main__":
    main()

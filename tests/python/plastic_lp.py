#!/usr/bin/env python3
"""Reference least-mass (plastic design) LP of a truss model with scipy.optimize.linprog.

Reads a strutwise.truss model (JSON) on stdin, builds the LP from the model file itself,
independently of the TypeScript engine, and solves it with linprog(method="highs"):

  minimize    sum_v (sum_{e in v} rho_e L_e) A_v
  subject to  B q_k + s_k W A = f_k     (free dofs of connected nodes; own weight half to each end, -y in 2D, -z in 3D)
              q_ek <= sigma_t A_v(e),  -q_ek <= sigma_c A_v(e)
              A_v >= 0, q free

over one force per member and checked case (every strength combination when the model has
combinations, else every load case). Prints JSON: { "mass": value, "status": text, "scipy": version }.
"""
import json
import sys

import numpy as np
import scipy
import scipy.sparse as sp
from scipy.optimize import linprog

GRAVITY = 9.80665
MASS_KG = {"kg": 1.0, "t": 1000.0, "lb": 0.45359237}
FORCE_N = {"N": 1.0, "kN": 1e3, "MN": 1e6, "lbf": 0.45359237 * GRAVITY, "kip": 1000 * 0.45359237 * GRAVITY}


def main() -> None:
    model = json.load(sys.stdin)
    dim = model["dimension"]
    nodes = model["nodes"]
    index = {n["id"]: i for i, n in enumerate(nodes)}
    xyz = np.array([[n["x"], n["y"], n.get("z", 0.0) if dim == 3 else 0.0] for n in nodes], dtype=float)
    mats = {m["id"]: m for m in model["materials"]}
    members = model["members"]
    nm = len(members)
    fixed = np.zeros(3 * len(nodes), dtype=bool)
    for i, n in enumerate(nodes):
        for a in n.get("fixed", []):
            fixed[3 * i + "xyz".index(a)] = True
        if dim == 2:
            fixed[3 * i + 2] = True
    connected = np.zeros(len(nodes), dtype=bool)
    groups, var_of = {}, []
    for m in members:
        key = m.get("group") or ("member:" + m["id"])
        groups.setdefault(key, len(groups))
        var_of.append(groups[key])
        connected[index[m["start"]]] = connected[index[m["end"]]] = True
    nv = len(groups)
    dofs = [d for d in range(3 * len(nodes)) if not fixed[d] and connected[d // 3]]
    row_of = {d: r for r, d in enumerate(dofs)}
    neq = len(dofs)

    def loads_of(lc):
        f = np.zeros(3 * len(nodes))
        for ld in lc["loads"]:
            i = index[ld["node"]]
            f[3 * i] += ld.get("fx", 0.0)
            f[3 * i + 1] += ld.get("fy", 0.0)
            if dim == 3:
                f[3 * i + 2] += ld.get("fz", 0.0)
        return f

    cases = []  # (loads, self-weight factor)
    by_id = {lc["id"]: lc for lc in model["loadCases"]}
    if model.get("combinations"):
        for c in model["combinations"]:
            if c["use"] != "strength":
                continue
            f, s = np.zeros(3 * len(nodes)), 0.0
            for lid, fac in c["factors"].items():
                f += fac * loads_of(by_id[lid])
                s += fac * by_id[lid].get("selfWeight", 0.0)
            cases.append((f, s))
    else:
        cases = [(loads_of(lc), lc.get("selfWeight", 0.0)) for lc in model["loadCases"]]

    w_per_mass = MASS_KG[model["units"]["mass"]] * GRAVITY / FORCE_N[model["units"]["force"]]
    grav = 1 if dim == 2 else 2
    lengths, cos = np.zeros(nm), np.zeros((nm, 3))
    for e, m in enumerate(members):
        d = xyz[index[m["end"]]] - xyz[index[m["start"]]]
        lengths[e] = np.linalg.norm(d)
        cos[e] = d / lengths[e]

    nk = len(cases)
    ncols = nv + nk * nm
    eq_r, eq_c, eq_v, b_eq = [], [], [], np.zeros(nk * neq)
    ub_r, ub_c, ub_v, nub = [], [], [], 0
    for k, (f, s) in enumerate(cases):
        for d, r in row_of.items():
            b_eq[k * neq + r] = f[d]
        for e, m in enumerate(members):
            i, j = index[m["start"]], index[m["end"]]
            col = nv + k * nm + e
            for a in range(3):
                for node, sign in ((i, -1.0), (j, 1.0)):
                    d = 3 * node + a
                    if d in row_of and cos[e, a] != 0:
                        eq_r.append(k * neq + row_of[d]); eq_c.append(col); eq_v.append(sign * cos[e, a])
            if s != 0:
                rho = mats[m["material"]]["density"]
                for node in (i, j):
                    d = 3 * node + grav
                    if d in row_of:
                        eq_r.append(k * neq + row_of[d]); eq_c.append(var_of[e]); eq_v.append(0.5 * s * rho * lengths[e] * w_per_mass)
            mat = mats[m["material"]]
            if "allowableTension" in mat:
                ub_r += [nub, nub]; ub_c += [col, var_of[e]]; ub_v += [1.0, -mat["allowableTension"]]; nub += 1
            if "allowableCompression" in mat:
                ub_r += [nub, nub]; ub_c += [col, var_of[e]]; ub_v += [-1.0, -mat["allowableCompression"]]; nub += 1
    cost = np.zeros(ncols)
    for e, m in enumerate(members):
        cost[var_of[e]] += mats[m["material"]]["density"] * lengths[e]
    A_eq = sp.coo_matrix((eq_v, (eq_r, eq_c)), shape=(nk * neq, ncols)).tocsr()
    A_ub = sp.coo_matrix((ub_v, (ub_r, ub_c)), shape=(nub, ncols)).tocsr()
    bounds = [(0, None)] * nv + [(None, None)] * (nk * nm)
    # the costs are tiny in mm/N/t; scaling the objective keeps HiGHS's tolerances meaningful
    scale = cost.max()
    res = linprog(cost / scale, A_ub=A_ub, b_ub=np.zeros(nub), A_eq=A_eq, b_eq=b_eq, bounds=bounds, method="highs")
    print(json.dumps({"mass": float(res.fun * scale) if res.status == 0 else None, "status": res.message, "scipy": scipy.__version__}))


if __name__ == "__main__":
    main()

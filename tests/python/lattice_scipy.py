#!/usr/bin/env python3
"""Reference solve of a truss model with scipy.sparse, independent of the TypeScript engine.

Reads a strutwise.truss model (JSON) on stdin, assembles the pin-jointed stiffness matrix
itself (coo_matrix), solves every load case with one sparse LU factorization
(scipy.sparse.linalg.splu) and prints JSON on stdout:
  { "displacements": { "<load case>": [[ux, uy, uz], ...] }, "factorSolveSeconds": t, "scipy": version }
Nodes without members and restrained directions get zero displacement.
"""
import json
import sys
import time

import numpy as np
import scipy
import scipy.sparse as sp
import scipy.sparse.linalg as spla


def main() -> None:
    model = json.load(sys.stdin)
    dim = model["dimension"]
    nodes = model["nodes"]
    index = {n["id"]: i for i, n in enumerate(nodes)}
    xyz = np.array([[n["x"], n["y"], n.get("z", 0.0) if dim == 3 else 0.0] for n in nodes], dtype=float)
    E = {m["id"]: m["E"] for m in model["materials"]}
    nn = len(nodes)
    fixed = np.zeros(3 * nn, dtype=bool)
    for i, n in enumerate(nodes):
        for a in n.get("fixed", []):
            fixed[3 * i + "xyz".index(a)] = True
        if dim == 2:
            fixed[3 * i + 2] = True
    connected = np.zeros(nn, dtype=bool)
    rows, cols, vals = [], [], []
    for m in model["members"]:
        i, j = index[m["start"]], index[m["end"]]
        connected[i] = connected[j] = True
        d = xyz[j] - xyz[i]
        L = float(np.linalg.norm(d))
        n = d / L
        k = E[m["material"]] * m["area"] / L * np.outer(n, n)
        block = np.block([[k, -k], [-k, k]])
        dofs = [3 * i, 3 * i + 1, 3 * i + 2, 3 * j, 3 * j + 1, 3 * j + 2]
        for a in range(6):
            for b in range(6):
                rows.append(dofs[a])
                cols.append(dofs[b])
                vals.append(block[a, b])
    for i in range(nn):
        if not connected[i]:
            fixed[3 * i : 3 * i + 3] = True
    K = sp.coo_matrix((vals, (rows, cols)), shape=(3 * nn, 3 * nn)).tocsc()
    free = np.flatnonzero(~fixed)
    Kff = K[free][:, free].tocsc()
    F = np.zeros((len(free), len(model["loadCases"])))
    for c, lc in enumerate(model["loadCases"]):
        f = np.zeros(3 * nn)
        for load in lc["loads"]:
            i = index[load["node"]]
            f[3 * i] += load.get("fx", 0.0)
            f[3 * i + 1] += load.get("fy", 0.0)
            if dim == 3:
                f[3 * i + 2] += load.get("fz", 0.0)
        F[:, c] = f[free]
    t0 = time.perf_counter()
    lu = spla.splu(Kff, permc_spec="MMD_AT_PLUS_A")
    U = lu.solve(F)
    seconds = time.perf_counter() - t0
    out = {}
    for c, lc in enumerate(model["loadCases"]):
        u = np.zeros(3 * nn)
        u[free] = U[:, c]
        out[lc["id"]] = u.reshape(nn, 3).tolist()
    json.dump({"displacements": out, "factorSolveSeconds": seconds, "scipy": scipy.__version__}, sys.stdout)


if __name__ == "__main__":
    main()

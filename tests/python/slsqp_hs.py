#!/usr/bin/env python3
"""Reference runs of scipy.optimize.minimize(method='SLSQP') on Hock-Schittkowski problems.

Reads a JSON list of problems on stdin in the format of tests/engine/sqp/hock-schittkowski.ts
(expressions in x[i], **, sin, cos, exp, log, sqrt, pi; eq = 0, ineq >= 0 as published) and
writes one JSON object per problem: x, fun, nit, nfev, njev, success, message, seconds.
Used by tests/engine/sqp/slsqp-crosscheck.test.ts and bench/sqp.bench.ts.
"""
import json
import math
import sys
import time

import numpy as np
from scipy.optimize import minimize

NAMES = {"sin": math.sin, "cos": math.cos, "exp": math.exp, "log": math.log, "sqrt": math.sqrt, "pi": math.pi}


def compile_expr(expr):
    code = compile(expr, "<hs>", "eval")
    return lambda x: float(eval(code, {"__builtins__": {}}, dict(NAMES, x=x)))


def run(p):
    f = compile_expr(p["f"])
    grad = [compile_expr(g) for g in p["grad"]]
    cons = []
    for kind in ("eq", "ineq"):
        for c in p.get(kind, []):
            fun = compile_expr(c["c"])
            jac = [compile_expr(j) for j in c["jac"]]
            cons.append({
                "type": kind,
                "fun": (lambda fun: lambda x: fun(x))(fun),
                "jac": (lambda jac: lambda x: np.array([j(x) for j in jac]))(jac),
            })
    n = p["n"]
    lower = p.get("lower") or [None] * n
    upper = p.get("upper") or [None] * n
    bounds = list(zip(lower, upper))
    x0 = np.array(p["x0"], dtype=float)
    t0 = time.perf_counter()
    r = minimize(lambda x: f(x), x0, jac=lambda x: np.array([g(x) for g in grad]), method="SLSQP",
                 bounds=bounds, constraints=cons, options={"maxiter": 500, "ftol": 1e-12})
    seconds = time.perf_counter() - t0
    return {
        "id": p["id"], "x": [float(v) for v in r.x], "fun": float(r.fun), "nit": int(r.nit),
        "nfev": int(r.nfev), "njev": int(getattr(r, "njev", 0)), "success": bool(r.success),
        "message": str(r.message), "seconds": seconds,
    }


def main():
    problems = json.load(sys.stdin)
    json.dump([run(p) for p in problems], sys.stdout)


if __name__ == "__main__":
    main()

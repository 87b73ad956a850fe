// Problems of the Hock-Schittkowski collection: W. Hock and K. Schittkowski (1981), "Test
// Examples for Nonlinear Programming Codes", Springer (monograph series volume 187). Functions, start points, bounds and optimal values are written here
// from memory of that publication; every optimum is re-checked against scipy's SLSQP in
// slsqp-crosscheck.test.ts whenever python3 with scipy is present.
//
// Expressions are strings in the common subset of TypeScript and Python (x[i], **, sin, cos,
// exp, log, sqrt, pi) so that the SAME table drives our solver and tests/python/slsqp_hs.py.
// Constraints follow the publication's form: eq = 0, ineq >= 0 (the adapter negates them into
// the solver's ineq <= 0 convention). Gradients are hand-derived; hs-table.test.ts checks each
// one against central differences so a slip in writing them down cannot hide.
import type { SqpProblem } from "~/engine/sqp";

export interface HsProblem {
  id: string;
  n: number;
  x0: number[];
  lower?: (number | null)[];
  upper?: (number | null)[];
  f: string;
  grad: string[];
  eq?: { c: string; jac: string[] }[];
  ineq?: { c: string; jac: string[] }[];
  fStar: number;
  xStar?: number[];
}

const U = null; // no bound

export const hockSchittkowski: HsProblem[] = [
  {
    id: "HS001", n: 2, x0: [-2, 1], lower: [U, -1.5],
    f: "100*(x[1]-x[0]**2)**2 + (1-x[0])**2",
    grad: ["-400*x[0]*(x[1]-x[0]**2) - 2*(1-x[0])", "200*(x[1]-x[0]**2)"],
    fStar: 0, xStar: [1, 1],
  },
  {
    id: "HS002", n: 2, x0: [-2, 1], lower: [U, 1.5],
    f: "100*(x[1]-x[0]**2)**2 + (1-x[0])**2",
    grad: ["-400*x[0]*(x[1]-x[0]**2) - 2*(1-x[0])", "200*(x[1]-x[0]**2)"],
    fStar: 0.0504261879, xStar: [1.224370749, 1.5],
  },
  {
    id: "HS003", n: 2, x0: [10, 1], lower: [U, 0],
    f: "x[1] + 1e-5*(x[1]-x[0])**2",
    grad: ["-2e-5*(x[1]-x[0])", "1 + 2e-5*(x[1]-x[0])"],
    fStar: 0, xStar: [0, 0],
  },
  {
    id: "HS004", n: 2, x0: [1.125, 0.125], lower: [1, 0],
    f: "(x[0]+1)**3/3 + x[1]",
    grad: ["(x[0]+1)**2", "1"],
    fStar: 8 / 3, xStar: [1, 0],
  },
  {
    id: "HS005", n: 2, x0: [0, 0], lower: [-1.5, -3], upper: [4, 3],
    f: "sin(x[0]+x[1]) + (x[0]-x[1])**2 - 1.5*x[0] + 2.5*x[1] + 1",
    grad: ["cos(x[0]+x[1]) + 2*(x[0]-x[1]) - 1.5", "cos(x[0]+x[1]) - 2*(x[0]-x[1]) + 2.5"],
    fStar: -Math.sqrt(3) / 2 - Math.PI / 3, xStar: [-Math.PI / 3 + 0.5, -Math.PI / 3 - 0.5],
  },
  {
    id: "HS006", n: 2, x0: [-1.2, 1],
    f: "(1-x[0])**2",
    grad: ["-2*(1-x[0])", "0"],
    eq: [{ c: "10*(x[1]-x[0]**2)", jac: ["-20*x[0]", "10"] }],
    fStar: 0, xStar: [1, 1],
  },
  {
    id: "HS007", n: 2, x0: [2, 2],
    f: "log(1+x[0]**2) - x[1]",
    grad: ["2*x[0]/(1+x[0]**2)", "-1"],
    eq: [{ c: "(1+x[0]**2)**2 + x[1]**2 - 4", jac: ["4*x[0]*(1+x[0]**2)", "2*x[1]"] }],
    fStar: -Math.sqrt(3), xStar: [0, Math.sqrt(3)],
  },
  {
    id: "HS008", n: 2, x0: [2, 1],
    f: "-1",
    grad: ["0", "0"],
    eq: [
      { c: "x[0]**2 + x[1]**2 - 25", jac: ["2*x[0]", "2*x[1]"] },
      { c: "x[0]*x[1] - 9", jac: ["x[1]", "x[0]"] },
    ],
    fStar: -1,
  },
  {
    id: "HS009", n: 2, x0: [0, 0],
    f: "sin(pi*x[0]/12)*cos(pi*x[1]/16)",
    grad: ["pi/12*cos(pi*x[0]/12)*cos(pi*x[1]/16)", "-pi/16*sin(pi*x[0]/12)*sin(pi*x[1]/16)"],
    eq: [{ c: "4*x[0] - 3*x[1]", jac: ["4", "-3"] }],
    fStar: -0.5,
  },
  {
    id: "HS010", n: 2, x0: [-10, 10],
    f: "x[0] - x[1]",
    grad: ["1", "-1"],
    ineq: [{ c: "-3*x[0]**2 + 2*x[0]*x[1] - x[1]**2 + 1", jac: ["-6*x[0] + 2*x[1]", "2*x[0] - 2*x[1]"] }],
    fStar: -1, xStar: [0, 1],
  },
  {
    id: "HS011", n: 2, x0: [4.9, 0.1],
    f: "(x[0]-5)**2 + x[1]**2 - 25",
    grad: ["2*(x[0]-5)", "2*x[1]"],
    ineq: [{ c: "-(x[0]**2) + x[1]", jac: ["-2*x[0]", "1"] }],
    fStar: -8.498464223, xStar: [1.234779, 1.524678],
  },
  {
    id: "HS012", n: 2, x0: [0, 0],
    f: "0.5*x[0]**2 + x[1]**2 - x[0]*x[1] - 7*x[0] - 7*x[1]",
    grad: ["x[0] - x[1] - 7", "2*x[1] - x[0] - 7"],
    ineq: [{ c: "25 - 4*x[0]**2 - x[1]**2", jac: ["-8*x[0]", "-2*x[1]"] }],
    fStar: -30, xStar: [2, 3],
  },
  {
    id: "HS014", n: 2, x0: [2, 2],
    f: "(x[0]-2)**2 + (x[1]-1)**2",
    grad: ["2*(x[0]-2)", "2*(x[1]-1)"],
    eq: [{ c: "x[0] - 2*x[1] + 1", jac: ["1", "-2"] }],
    ineq: [{ c: "-(x[0]**2)/4 - x[1]**2 + 1", jac: ["-x[0]/2", "-2*x[1]"] }],
    fStar: 9 - (23 / 8) * Math.sqrt(7), xStar: [(Math.sqrt(7) - 1) / 2, (Math.sqrt(7) + 1) / 4],
  },
  {
    id: "HS015", n: 2, x0: [-2, 1], upper: [0.5, U],
    f: "100*(x[1]-x[0]**2)**2 + (1-x[0])**2",
    grad: ["-400*x[0]*(x[1]-x[0]**2) - 2*(1-x[0])", "200*(x[1]-x[0]**2)"],
    ineq: [
      { c: "x[0]*x[1] - 1", jac: ["x[1]", "x[0]"] },
      { c: "x[0] + x[1]**2", jac: ["1", "2*x[1]"] },
    ],
    fStar: 306.5, xStar: [0.5, 2],
  },
  {
    // the published start point (-1, -1) lies outside the bounds: the solver projects it
    id: "HS021", n: 2, x0: [-1, -1], lower: [2, -50], upper: [50, 50],
    f: "0.01*x[0]**2 + x[1]**2 - 100",
    grad: ["0.02*x[0]", "2*x[1]"],
    ineq: [{ c: "10*x[0] - x[1] - 10", jac: ["10", "-1"] }],
    fStar: -99.96, xStar: [2, 0],
  },
  {
    id: "HS022", n: 2, x0: [2, 2],
    f: "(x[0]-2)**2 + (x[1]-1)**2",
    grad: ["2*(x[0]-2)", "2*(x[1]-1)"],
    ineq: [
      { c: "-x[0] - x[1] + 2", jac: ["-1", "-1"] },
      { c: "-(x[0]**2) + x[1]", jac: ["-2*x[0]", "1"] },
    ],
    fStar: 1, xStar: [1, 1],
  },
  {
    id: "HS027", n: 3, x0: [2, 2, 2],
    f: "0.01*(x[0]-1)**2 + (x[1]-x[0]**2)**2",
    grad: ["0.02*(x[0]-1) - 4*x[0]*(x[1]-x[0]**2)", "2*(x[1]-x[0]**2)", "0"],
    eq: [{ c: "x[0] + x[2]**2 + 1", jac: ["1", "0", "2*x[2]"] }],
    fStar: 0.04, xStar: [-1, 1, 0],
  },
  {
    id: "HS028", n: 3, x0: [-4, 1, 1],
    f: "(x[0]+x[1])**2 + (x[1]+x[2])**2",
    grad: ["2*(x[0]+x[1])", "2*(x[0]+x[1]) + 2*(x[1]+x[2])", "2*(x[1]+x[2])"],
    eq: [{ c: "x[0] + 2*x[1] + 3*x[2] - 1", jac: ["1", "2", "3"] }],
    fStar: 0, xStar: [0.5, -0.5, 0.5],
  },
  {
    id: "HS035", n: 3, x0: [0.5, 0.5, 0.5], lower: [0, 0, 0],
    f: "9 - 8*x[0] - 6*x[1] - 4*x[2] + 2*x[0]**2 + 2*x[1]**2 + x[2]**2 + 2*x[0]*x[1] + 2*x[0]*x[2]",
    grad: ["-8 + 4*x[0] + 2*x[1] + 2*x[2]", "-6 + 4*x[1] + 2*x[0]", "-4 + 2*x[2] + 2*x[0]"],
    ineq: [{ c: "3 - x[0] - x[1] - 2*x[2]", jac: ["-1", "-1", "-2"] }],
    fStar: 1 / 9, xStar: [4 / 3, 7 / 9, 4 / 9],
  },
  {
    id: "HS039", n: 4, x0: [2, 2, 2, 2],
    f: "-x[0]",
    grad: ["-1", "0", "0", "0"],
    eq: [
      { c: "x[1] - x[0]**3 - x[2]**2", jac: ["-3*x[0]**2", "1", "-2*x[2]", "0"] },
      { c: "x[0]**2 - x[1] - x[3]**2", jac: ["2*x[0]", "-1", "0", "-2*x[3]"] },
    ],
    fStar: -1, xStar: [1, 1, 0, 0],
  },
  {
    id: "HS042", n: 4, x0: [1, 1, 1, 1],
    f: "(x[0]-1)**2 + (x[1]-2)**2 + (x[2]-3)**2 + (x[3]-4)**2",
    grad: ["2*(x[0]-1)", "2*(x[1]-2)", "2*(x[2]-3)", "2*(x[3]-4)"],
    eq: [
      { c: "x[0] - 2", jac: ["1", "0", "0", "0"] },
      { c: "x[2]**2 + x[3]**2 - 2", jac: ["0", "0", "2*x[2]", "2*x[3]"] },
    ],
    fStar: 28 - 10 * Math.SQRT2, xStar: [2, 2, 0.6 * Math.SQRT2, 0.8 * Math.SQRT2],
  },
  {
    id: "HS043", n: 4, x0: [0, 0, 0, 0],
    f: "x[0]**2 + x[1]**2 + 2*x[2]**2 + x[3]**2 - 5*x[0] - 5*x[1] - 21*x[2] + 7*x[3]",
    grad: ["2*x[0] - 5", "2*x[1] - 5", "4*x[2] - 21", "2*x[3] + 7"],
    ineq: [
      { c: "8 - x[0]**2 - x[1]**2 - x[2]**2 - x[3]**2 - x[0] + x[1] - x[2] + x[3]", jac: ["-2*x[0] - 1", "-2*x[1] + 1", "-2*x[2] - 1", "-2*x[3] + 1"] },
      { c: "10 - x[0]**2 - 2*x[1]**2 - x[2]**2 - 2*x[3]**2 + x[0] + x[3]", jac: ["-2*x[0] + 1", "-4*x[1]", "-2*x[2]", "-4*x[3] + 1"] },
      { c: "5 - 2*x[0]**2 - x[1]**2 - x[2]**2 - 2*x[0] + x[1] + x[3]", jac: ["-4*x[0] - 2", "-2*x[1] + 1", "-2*x[2]", "1"] },
    ],
    fStar: -44, xStar: [0, 1, 2, -1],
  },
  {
    id: "HS044", n: 4, x0: [0, 0, 0, 0], lower: [0, 0, 0, 0],
    f: "x[0] - x[1] - x[2] - x[0]*x[2] + x[0]*x[3] + x[1]*x[2] - x[1]*x[3]",
    grad: ["1 - x[2] + x[3]", "-1 + x[2] - x[3]", "-1 - x[0] + x[1]", "x[0] - x[1]"],
    ineq: [
      { c: "8 - x[0] - 2*x[1]", jac: ["-1", "-2", "0", "0"] },
      { c: "12 - 4*x[0] - x[1]", jac: ["-4", "-1", "0", "0"] },
      { c: "12 - 3*x[0] - 4*x[1]", jac: ["-3", "-4", "0", "0"] },
      { c: "8 - 2*x[2] - x[3]", jac: ["0", "0", "-2", "-1"] },
      { c: "8 - x[2] - 2*x[3]", jac: ["0", "0", "-1", "-2"] },
      { c: "5 - x[2] - x[3]", jac: ["0", "0", "-1", "-1"] },
    ],
    fStar: -15, xStar: [0, 3, 0, 4],
  },
  {
    id: "HS048", n: 5, x0: [3, 5, -3, 2, -2],
    f: "(x[0]-1)**2 + (x[1]-x[2])**2 + (x[3]-x[4])**2",
    grad: ["2*(x[0]-1)", "2*(x[1]-x[2])", "-2*(x[1]-x[2])", "2*(x[3]-x[4])", "-2*(x[3]-x[4])"],
    eq: [
      { c: "x[0] + x[1] + x[2] + x[3] + x[4] - 5", jac: ["1", "1", "1", "1", "1"] },
      { c: "x[2] - 2*(x[3]+x[4]) + 3", jac: ["0", "0", "1", "-2", "-2"] },
    ],
    fStar: 0, xStar: [1, 1, 1, 1, 1],
  },
  {
    id: "HS051", n: 5, x0: [2.5, 0.5, 2, -1, 0.5],
    f: "(x[0]-x[1])**2 + (x[1]+x[2]-2)**2 + (x[3]-1)**2 + (x[4]-1)**2",
    grad: ["2*(x[0]-x[1])", "-2*(x[0]-x[1]) + 2*(x[1]+x[2]-2)", "2*(x[1]+x[2]-2)", "2*(x[3]-1)", "2*(x[4]-1)"],
    eq: [
      { c: "x[0] + 3*x[1] - 4", jac: ["1", "3", "0", "0", "0"] },
      { c: "x[2] + x[3] - 2*x[4]", jac: ["0", "0", "1", "1", "-2"] },
      { c: "x[1] - x[4]", jac: ["0", "1", "0", "0", "-1"] },
    ],
    fStar: 0, xStar: [1, 1, 1, 1, 1],
  },
  {
    id: "HS065", n: 3, x0: [-5, 5, 0], lower: [-4.5, -4.5, -5], upper: [4.5, 4.5, 5],
    f: "(x[0]-x[1])**2 + (x[0]+x[1]-10)**2/9 + (x[2]-5)**2",
    grad: ["2*(x[0]-x[1]) + 2*(x[0]+x[1]-10)/9", "-2*(x[0]-x[1]) + 2*(x[0]+x[1]-10)/9", "2*(x[2]-5)"],
    ineq: [{ c: "48 - x[0]**2 - x[1]**2 - x[2]**2", jac: ["-2*x[0]", "-2*x[1]", "-2*x[2]"] }],
    fStar: 0.9535288567, xStar: [3.650461821, 3.65046168, 4.6204170507],
  },
  {
    id: "HS071", n: 4, x0: [1, 5, 5, 1], lower: [1, 1, 1, 1], upper: [5, 5, 5, 5],
    f: "x[0]*x[3]*(x[0]+x[1]+x[2]) + x[2]",
    grad: ["x[3]*(2*x[0]+x[1]+x[2])", "x[0]*x[3]", "x[0]*x[3] + 1", "x[0]*(x[0]+x[1]+x[2])"],
    eq: [{ c: "x[0]**2 + x[1]**2 + x[2]**2 + x[3]**2 - 40", jac: ["2*x[0]", "2*x[1]", "2*x[2]", "2*x[3]"] }],
    ineq: [{ c: "x[0]*x[1]*x[2]*x[3] - 25", jac: ["x[1]*x[2]*x[3]", "x[0]*x[2]*x[3]", "x[0]*x[1]*x[3]", "x[0]*x[1]*x[2]"] }],
    fStar: 17.0140173, xStar: [1, 4.742994, 3.821150, 1.379408],
  },
  {
    id: "HS076", n: 4, x0: [0.5, 0.5, 0.5, 0.5], lower: [0, 0, 0, 0],
    f: "x[0]**2 + 0.5*x[1]**2 + x[2]**2 + 0.5*x[3]**2 - x[0]*x[2] + x[2]*x[3] - x[0] - 3*x[1] + x[2] - x[3]",
    grad: ["2*x[0] - x[2] - 1", "x[1] - 3", "2*x[2] - x[0] + x[3] + 1", "x[3] + x[2] - 1"],
    ineq: [
      { c: "5 - x[0] - 2*x[1] - x[2] - x[3]", jac: ["-1", "-2", "-1", "-1"] },
      { c: "4 - 3*x[0] - x[1] - 2*x[2] + x[3]", jac: ["-3", "-1", "-2", "1"] },
      { c: "x[1] + 4*x[2] - 1.5", jac: ["0", "1", "4", "0"] },
    ],
    fStar: -4.681818181, xStar: [0.2727273, 2.090909, 0, 0.5454545],
  },
  {
    id: "HS078", n: 5, x0: [-2, 1.5, 2, -1, -1],
    f: "x[0]*x[1]*x[2]*x[3]*x[4]",
    grad: ["x[1]*x[2]*x[3]*x[4]", "x[0]*x[2]*x[3]*x[4]", "x[0]*x[1]*x[3]*x[4]", "x[0]*x[1]*x[2]*x[4]", "x[0]*x[1]*x[2]*x[3]"],
    eq: [
      { c: "x[0]**2 + x[1]**2 + x[2]**2 + x[3]**2 + x[4]**2 - 10", jac: ["2*x[0]", "2*x[1]", "2*x[2]", "2*x[3]", "2*x[4]"] },
      { c: "x[1]*x[2] - 5*x[3]*x[4]", jac: ["0", "x[2]", "x[1]", "-5*x[4]", "-5*x[3]"] },
      { c: "x[0]**3 + x[1]**3 + 1", jac: ["3*x[0]**2", "3*x[1]**2", "0", "0", "0"] },
    ],
    fStar: -2.91970041, xStar: [-1.717143, 1.595709, 1.827247, -0.7636413, -0.763645],
  },
  {
    id: "HS079", n: 5, x0: [2, 2, 2, 2, 2],
    f: "(x[0]-1)**2 + (x[0]-x[1])**2 + (x[1]-x[2])**2 + (x[2]-x[3])**4 + (x[3]-x[4])**4",
    grad: [
      "2*(x[0]-1) + 2*(x[0]-x[1])",
      "-2*(x[0]-x[1]) + 2*(x[1]-x[2])",
      "-2*(x[1]-x[2]) + 4*(x[2]-x[3])**3",
      "-4*(x[2]-x[3])**3 + 4*(x[3]-x[4])**3",
      "-4*(x[3]-x[4])**3",
    ],
    eq: [
      { c: "x[0] + x[1]**2 + x[2]**3 - 2 - 3*sqrt(2)", jac: ["1", "2*x[1]", "3*x[2]**2", "0", "0"] },
      { c: "x[1] - x[2]**2 + x[3] + 2 - 2*sqrt(2)", jac: ["0", "1", "-2*x[2]", "1", "0"] },
      { c: "x[0]*x[4] - 2", jac: ["x[4]", "0", "0", "0", "x[0]"] },
    ],
    fStar: 0.0787768209, xStar: [1.191127, 1.362603, 1.472818, 1.635017, 1.679081],
  },
];

type Fn = (x: ArrayLike<number>) => number;
const compiled = new Map<string, Fn>();
/** Compiles one table expression (test code only; the table is ours, not user input). */
export function compile(expr: string): Fn {
  let fn = compiled.get(expr);
  if (!fn) {
    fn = new Function("x", `"use strict"; const { sin, cos, exp, log, sqrt, PI: pi } = Math; return (${expr});`) as Fn;
    compiled.set(expr, fn);
  }
  return fn;
}

/** The table entry as an SqpProblem (ineq negated into the solver's <= 0 form). */
export function toSqpProblem(p: HsProblem): SqpProblem {
  const f = compile(p.f);
  const grad = p.grad.map(compile);
  const eq = (p.eq ?? []).map((c) => ({ c: compile(c.c), jac: c.jac.map(compile) }));
  const ineq = (p.ineq ?? []).map((c) => ({ c: compile(c.c), jac: c.jac.map(compile) }));
  return {
    n: p.n,
    x0: p.x0,
    lower: p.lower?.map((v) => (v === null ? -Infinity : v)),
    upper: p.upper?.map((v) => (v === null ? Infinity : v)),
    nEq: eq.length,
    nIneq: ineq.length,
    evaluate: (x) => ({
      f: f(x),
      eq: Float64Array.from(eq, (c) => c.c(x)),
      ineq: Float64Array.from(ineq, (c) => -c.c(x)),
    }),
    derivatives: (x, rows) => ({
      grad: Float64Array.from(grad, (g) => g(x)),
      eq: eq.map((c) => Float64Array.from(c.jac, (d) => d(x))),
      ineq: Array.from(rows, (i) => Float64Array.from(ineq[i].jac, (d) => -d(x))),
    }),
  };
}

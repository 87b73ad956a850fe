// Models the e2e tests build in code (invented for Strutwise): shapes sized for what a test
// needs, such as a run that is still going when the test presses a button.

/** A double-layer grid roof on perimeter supports (n × n top nodes), with a design block. */
export function gridRoof(n: number) {
  const bay = 3000;
  const nodes: { id: string; x: number; y: number; z: number; fixed?: string[] }[] = [];
  const members: { id: string; start: string; end: string; material: string; area: number }[] = [];
  for (let i = 0; i < n; i++)
    for (let j = 0; j < n; j++)
      nodes.push({ id: `T${i}_${j}`, x: i * bay, y: j * bay, z: 2000, ...(i === 0 || j === 0 || i === n - 1 || j === n - 1 ? { fixed: ["x", "y", "z"] } : {}) });
  for (let i = 0; i < n - 1; i++) for (let j = 0; j < n - 1; j++) nodes.push({ id: `L${i}_${j}`, x: (i + 0.5) * bay, y: (j + 0.5) * bay, z: 0 });
  const add = (a: string, b: string) => members.push({ id: `${a}-${b}`, start: a, end: b, material: "S355", area: 1500 });
  for (let i = 0; i < n; i++)
    for (let j = 0; j < n; j++) {
      if (i + 1 < n) add(`T${i}_${j}`, `T${i + 1}_${j}`);
      if (j + 1 < n) add(`T${i}_${j}`, `T${i}_${j + 1}`);
    }
  for (let i = 0; i < n - 1; i++)
    for (let j = 0; j < n - 1; j++) {
      if (i + 2 < n) add(`L${i}_${j}`, `L${i + 1}_${j}`);
      if (j + 2 < n) add(`L${i}_${j}`, `L${i}_${j + 1}`);
      for (const [di, dj] of [[0, 0], [1, 0], [0, 1], [1, 1]]) add(`L${i}_${j}`, `T${i + di!}_${j + dj!}`);
    }
  const inner = nodes.filter((x) => x.id.startsWith("T") && !x.fixed);
  return {
    dimension: 3,
    nodes,
    members,
    loadCases: [{ id: "ROOF", name: "Roof load", loads: inner.map((x) => ({ node: x.id, fz: -9000 })) }],
    design: { objective: "mass", areaBounds: { min: 100, max: 20000 }, constraints: { stress: true, displacement: [{ node: "*", axis: "z", limit: 60 }] }, solver: { maxIterations: 500, tolerance: 1e-9 } },
  };
}

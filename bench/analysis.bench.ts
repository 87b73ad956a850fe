// Wall time and memory of the truss analysis on generated 3D lattices with two load cases,
// beside scipy.sparse's factor + solve time for the same model when python3-scipy is present.
// Goal (issue 3): a 10k-member 3D truss under 0.5 s on 2 cores, memory about linear in size.
import { analyze, buildStructure, type TrussModel } from "../app/engine/truss";
import { latticeModel } from "../tests/engine/truss/models";
import { scipyAvailable, scipySolve } from "../tests/engine/truss/scipy";

const gc = (globalThis as { gc?: () => void }).gc ?? (() => {});
const mem = () => {
  const m = process.memoryUsage();
  return m.heapUsed + m.arrayBuffers;
};
const ms = (t: number) => `${t.toFixed(0).padStart(6)} ms`;
const mb = (b: number) => `${(b / 2 ** 20).toFixed(1).padStart(6)} MB`;

const haveScipy = scipyAvailable();
if (!haveScipy) console.log("!!! python3 with scipy not found: the scipy.sparse column is left out (install python3-scipy)");

function run(label: string, model: TrussModel, repeats = 3) {
  gc();
  gc(); // twice: array buffers of the previous model are released on a later pass
  const before = mem();
  const t0 = performance.now();
  const s = buildStructure(model);
  let a = analyze(s);
  const first = performance.now() - t0;
  gc();
  const held = mem() - before; // structure + analysis with its factor, still referenced
  const times: number[] = [];
  for (let r = 0; r < repeats; r++) {
    const t = performance.now();
    a = analyze(s);
    times.push(performance.now() - t);
  }
  times.sort((x, y) => x - y);
  let scipyText = "";
  if (haveScipy) {
    const ref = scipySolve(model);
    let worst = 0, scale = 0;
    model.loadCases.forEach((lc, k) => {
      ref.displacements[lc.id].flat().forEach((v, d) => {
        worst = Math.max(worst, Math.abs(v - a.displacements[k][d]));
        scale = Math.max(scale, Math.abs(v));
      });
    });
    scipyText = `  scipy splu factor+solve ${ms(ref.factorSolveSeconds * 1000)}  max |du|/|u| ${(worst / scale).toExponential(1)}`;
  }
  console.log(
    `${label.padEnd(22)} members ${String(model.members.length).padStart(6)}  dofs ${String(s.nodeIds.length * 3).padStart(6)}  ` +
      `first ${ms(first)}  again ${ms(times[0])}  held ${mb(held)} (${String(Math.round(held / model.members.length)).padStart(4)} B/member)  factor ${String(a.profile).padStart(9)} entries${scipyText}`,
  );
}

console.log("tower family: 6 x 6 cells in plan, growing in height (typical of masts and long girders)");
for (const nz of [4, 35, 172]) run(`tower 6x6x${nz}`, latticeModel(6, 6, nz));
console.log("block family: near-cubic lattices (the hardest shape for any sparse factorization)");
for (const [nx, ny, nz] of [[5, 5, 5], [10, 10, 14]] as const) run(`block ${nx}x${ny}x${nz}`, latticeModel(nx, ny, nz));
console.log(`peak resident memory of this process: ${mb(process.resourceUsage().maxRSS * 1024)}`);

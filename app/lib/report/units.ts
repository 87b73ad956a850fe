// Unit labels derived from the model's declared units (docs/model-format.md: stress is force per
// length squared, volume is length cubed).
import type { Units } from "~/engine/design/result-types";

export function unitLabels(u: Units) {
  return {
    length: u.length,
    force: u.force,
    mass: u.mass,
    area: `${u.length}²`,
    stress: `${u.force}/${u.length}²`,
    volume: `${u.length}³`,
    density: `${u.mass}/${u.length}³`,
  };
}

export type UnitLabels = ReturnType<typeof unitLabels>;

export function objectiveUnit(kind: "mass" | "compliance", u: Units): string {
  return kind === "mass" ? u.mass : `${u.force}·${u.length}`;
}

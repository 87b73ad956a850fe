// Unit symbols of the report, in the model's declared units, spelled by the one formatter
// (app/lib/format.ts): stress reads "MPa" for N and mm in the tables as in the sentences.
import type { Units } from "~/engine/design/result-types";
import { quantityFormatter } from "~/lib/format";

export function unitLabels(u: Units) {
  const q = quantityFormatter(u);
  return {
    length: q.unit("length"),
    force: q.unit("force"),
    mass: q.unit("mass"),
    area: q.unit("area"),
    stress: q.unit("stress"),
    volume: q.unit("volume"),
    density: q.unit("density"),
  };
}

export type UnitLabels = ReturnType<typeof unitLabels>;

export function objectiveUnit(kind: "mass" | "compliance", u: Units): string {
  return quantityFormatter(u).unit(kind);
}

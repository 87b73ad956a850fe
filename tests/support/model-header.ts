// The opening fields every generated test and benchmark model shares: the format tag, the
// units and one structural steel (E 210 GPa, 7850 kg/m3; allowables as given, in MPa).
export interface SteelAllowables {
  tension: number;
  compression: number;
}

export function steelModelHeader(name: string, dimension: 2 | 3, allowable: SteelAllowables, description?: string) {
  return {
    format: "strutwise.truss" as const,
    version: 1 as const,
    name,
    ...(description ? { description } : {}),
    units: { length: "mm" as const, force: "N" as const, mass: "t" as const },
    dimension,
    materials: [{ id: "steel", E: 210000, density: 7.85e-9, allowableTension: allowable.tension, allowableCompression: allowable.compression }],
  };
}

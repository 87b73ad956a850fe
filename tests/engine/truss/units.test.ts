// Exact conversion factors (NIST Special Publication 811, appendix B: the inch is 0.0254 m and
// the pound 0.45359237 kg exactly; standard gravity 9.80665 m/s^2 defines the pound-force).
import { describe, expect, it } from "vitest";
import { convertUnit, unitLabel } from "~/engine/truss";
import { formatQuantity, quantityFormatter } from "~/lib/format";

describe("unit conversion", () => {
  it("length", () => {
    expect(convertUnit(1, "length", "in", "mm")).toBe(25.4);
    expect(convertUnit(1, "length", "ft", "m")).toBe(0.3048);
    expect(convertUnit(12, "length", "in", "ft")).toBeCloseTo(1, 15);
    expect(convertUnit(250, "length", "cm", "m")).toBe(2.5);
  });
  it("force", () => {
    expect(convertUnit(1, "force", "lbf", "N")).toBeCloseTo(4.4482216152605, 13);
    expect(convertUnit(1, "force", "kip", "kN")).toBeCloseTo(4.4482216152605, 12);
    expect(convertUnit(3, "force", "MN", "kN")).toBe(3000);
  });
  it("mass", () => {
    expect(convertUnit(1, "mass", "lb", "kg")).toBe(0.45359237);
    expect(convertUnit(2.5, "mass", "t", "kg")).toBe(2500);
  });
  it("derived quantities between systems", () => {
    const si = { length: "m", force: "N", mass: "kg" } as const;
    const mmN = { length: "mm", force: "N", mass: "t" } as const;
    const us = { length: "in", force: "kip", mass: "lb" } as const;
    // 1 ksi = 6.894757293168361 MPa (common practice, from the factors above)
    expect(convertUnit(1, "stress", us, mmN)).toBeCloseTo(6.894757293168361, 12);
    expect(convertUnit(1, "stress", mmN, si)).toBeCloseTo(1e6, 6);
    // steel density 7850 kg/m^3 = 7.85e-9 t/mm^3 (common practice)
    expect(convertUnit(7850, "density", si, mmN)).toBeCloseTo(7.85e-9, 20);
    expect(convertUnit(1, "area", "in", "mm")).toBeCloseTo(645.16, 10);
    expect(convertUnit(1, "volume", "m", "mm")).toBeCloseTo(1e9, 3);
    expect(() => convertUnit(1, "stress", "MPa", "ksi")).toThrow(/not a stress unit/);
  });
  it("labels and formatting", () => {
    expect(unitLabel("stress", { length: "mm", force: "N", mass: "t" })).toBe("MPa");
    expect(unitLabel("stress", { length: "in", force: "kip", mass: "lb" })).toBe("ksi");
    expect(unitLabel("stress", { length: "cm", force: "kN", mass: "kg" })).toBe("kN/cm²");
    expect(quantityFormatter({ length: "m", force: "N", mass: "kg" }, "kN-m").text(12345.678, "force")).toBe("12.35 kN");
    expect(formatQuantity(0.0000123, "length", { length: "m", force: "N", mass: "kg" })).toBe("12.30e-6 m");
  });
});

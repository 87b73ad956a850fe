// CSV downloads of the member and node tables follow RFC 4180 (section 2: fields with commas,
// quotes or line breaks are enclosed in double quotes; a quote inside is doubled; records end
// with CRLF). The formula guard is common practice against spreadsheet formula injection.
import { describe, expect, it } from "vitest";
import { csvField, fileSlug, toCsv } from "~/components/tables/csv";

describe("csv (RFC 4180)", () => {
  it("quotes fields with commas, quotes and line breaks, doubling inner quotes (RFC 4180 §2.6, §2.7)", () => {
    expect(csvField("plain")).toBe("plain");
    expect(csvField("a,b")).toBe('"a,b"');
    expect(csvField('say "hi"')).toBe('"say ""hi"""');
    expect(csvField("two\nlines")).toBe('"two\nlines"');
  });

  it("ends every record with CRLF, header first (RFC 4180 §2.1, §2.3)", () => {
    expect(toCsv(["member", "area"], [["AB", 812.4], ["BC", 1e-7]])).toBe("member,area\r\nAB,812.4\r\nBC,1e-7\r\n");
  });

  it("writes numbers in full precision and leaves non-finite values empty", () => {
    expect(csvField(0.1 + 0.2)).toBe("0.3"); // 12 significant figures drop the binary rounding tail
    expect(csvField(Number.NaN)).toBe("");
    expect(csvField(null)).toBe("");
    expect(csvField(-25000)).toBe("-25000");
  });

  it("keeps spreadsheet formulas from running (common practice), but not negative numbers as text", () => {
    expect(csvField("=SUM(A1)")).toBe("'=SUM(A1)");
    expect(csvField("-3.5")).toBe("-3.5");
    // every start OWASP's CSV-injection advice names (common practice): = + - @ tab CR
    expect(csvField("+cmd|' /C calc'!A0")).toBe("'+cmd|' /C calc'!A0");
    expect(csvField("@SUM(1+9)*cmd|' /C calc'!A0")).toBe("'@SUM(1+9)*cmd|' /C calc'!A0");
    expect(csvField("\t=1+2")).toBe("'\t=1+2");
    expect(csvField("\r=1+2")).toBe(`"'\r=1+2"`);
    // text that starts like a number but is a formula is guarded; a number as text is not
    expect(csvField("-1+1|cmd")).toBe("'-1+1|cmd");
    expect(csvField("+4e3")).toBe("+4e3");
    expect(csvField(-3.2)).toBe("-3.2");
    // bidi controls in a typed name are dropped (Trojan-Source style reordering)
    expect(csvField("truss\u202Efdp.exe")).toBe("trussfdp.exe");
  });

  it("makes file-name-safe slugs", () => {
    expect(fileSlug("Footbridge option B / rev 2")).toBe("footbridge-option-b-rev-2");
    expect(fileSlug("***")).toBe("strutwise");
  });
});

import { describe, expect, it } from "vitest";
import { isFormulaLike, MAX_CELL_CHARS, safeText, xmlSafeText } from "@/lib/exports/safe-text";

describe("safeText", () => {
  it("keeps text exactly as stored, formula-looking or not", () => {
    for (const text of ['=HYPERLINK("http://x")', "+1+2", "-20 °C rack", "@SUM(A1)", "\tx", "\rx", "plain"]) expect(safeText(text)).toBe(text);
  });

  it("writes nothing for empty values and text for other values", () => {
    expect(safeText(null)).toBeNull();
    expect(safeText(undefined)).toBeNull();
    expect(safeText("")).toBeNull();
    expect(safeText(12)).toBe("12");
  });

  it("cuts text over the cell limit of 32,767 characters with a visible mark", () => {
    const cut = safeText("x".repeat(40_000))!;
    expect(cut).toHaveLength(MAX_CELL_CHARS);
    expect(cut.endsWith("[cut at the cell limit]")).toBe(true);
  });
});

describe("isFormulaLike", () => {
  it.each(["=1", "+1", "-1", "@A1", "\t=1", "\r=1"])("flags %j", (text) => expect(isFormulaLike(text)).toBe(true));
  it.each(["1", "a=1", " =1", "DE-1", ""])("passes %j", (text) => expect(isFormulaLike(text)).toBe(false));
});

describe("xmlSafeText", () => {
  it("drops what XML cannot hold and ends lines with line feeds, keeping markup characters and surrogate pairs", () => {
    expect(xmlSafeText("a\r\nb\rc\nd")).toBe("a\nb\nc\nd");
    expect(xmlSafeText("\u0000bell\u0007 tab\t ok\u000B\uFFFE\uFFFF")).toBe("bell tab\t ok");
    expect(xmlSafeText("pair \uD83D\uDE00, lone \uD800 and \uDE00")).toBe("pair \uD83D\uDE00, lone  and ");
    expect(xmlSafeText("C < LFL & T > Tf")).toBe("C < LFL & T > Tf");
  });
});

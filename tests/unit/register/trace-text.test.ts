import { describe, expect, it } from "vitest";
import { citingWith, CITE_FROM_CHARS, traceNumber, traceText } from "@/lib/register/trace-text";

// Invented traces in the engine's shape (lib/hazard/trace.ts); the numbers are worked here:
// acetone, Antoine (Poling 5th ed. App. A: A 4.2184, B 1197.01, C 228.06 with T in °C, P in bar)
// at 25 °C: log10(P/bar) = 4.2184 − 1197.01/(25 + 228.06) = −0.51194 → P = 0.30760 bar = 30.760 kPa
// (handbook value near 30.8 kPa, CRC Handbook of Chemistry and Physics, vapor pressure table).
const LONG = "Poling, Prausnitz & O'Connell, The Properties of Gases and Liquids, 5th ed. (McGraw-Hill 2001), Appendix A, Antoine constants";

const ENCLOSURE = {
  rule: "enclosure-lfl",
  scenario: "in_control",
  method: "Vapor in a closed unit as a fraction of the LFL",
  inputs: [{ name: "Worst-case temperature", symbol: "T", value: 25, unit: "°C", source: "design maximum" }],
  result: { name: "Fraction of the LFL", symbol: "f", value: 1230.4, unit: "% LFL" },
  warnings: ["A bound, reached only at equilibrium"],
  parts: [
    {
      method: "Saturation vapor pressure",
      source: LONG,
      inputs: [
        { name: "Antoine A", symbol: "A", value: 4.2184, unit: "", source: LONG },
        { name: "Antoine B", symbol: "B", value: 1197.01, unit: "K", source: LONG },
      ],
      steps: [
        { description: "Antoine equation", formula: "log10(P/bar) = A − B/(T + C)", substituted: "log10(P/bar) = 4.2184 − 1197.01/(25 + 228.06); P = 30.760 kPa", result: { name: "Saturation vapor pressure", symbol: "Psat", value: 30.76012345, unit: "kPa" } },
        { description: "Mole fraction", formula: "y = Psat/Patm", substituted: "y = 30.76/101.325", result: { name: "Vapor mole fraction", symbol: "y", value: 0.303577, unit: "" } },
      ],
      result: { name: "Saturation vapor pressure", symbol: "Psat", value: 30.76012345, unit: "kPa" },
    },
  ],
};

describe("traceText", () => {
  it("writes a line per input, step, result and warning, indenting parts, citing long sources once per text", () => {
    const ids = new Map<string, number>();
    const citing = citingWith((text) => {
      if (!ids.has(text)) ids.set(text, 40 + ids.size);
      return ids.get(text)!;
    });
    expect(traceText(ENCLOSURE, citing.cite).split("\n")).toEqual([
      "Method: Vapor in a closed unit as a fraction of the LFL",
      "Worst-case temperature (T) = 25 °C — design maximum",
      "Result: Fraction of the LFL (f) = 1230.4 % LFL",
      "Warning: A bound, reached only at equilibrium",
      "Part 1: Saturation vapor pressure — [S40]",
      "  Antoine A (A) = 4.2184 — [S40]",
      "  Antoine B (B) = 1197.01 K — [S40]",
      // The formula with the numbers ends in its result: not repeated.
      "  Antoine equation: log10(P/bar) = A − B/(T + C); log10(P/bar) = 4.2184 − 1197.01/(25 + 228.06); P = 30.760 kPa — Saturation vapor pressure (Psat)",
      // It does not: the result follows, to six significant figures.
      "  Mole fraction: y = Psat/Patm; y = 30.76/101.325 → 0.303577 — Vapor mole fraction (y)",
      "  Result: Saturation vapor pressure (Psat) = 30.7601 kPa",
    ]);
    expect(citing.ids()).toEqual([40]);
  });

  it("cites a note from CITE_FROM_CHARS characters on and keeps shorter ones inline", () => {
    const atLimit = "x".repeat(CITE_FROM_CHARS);
    const below = "y".repeat(CITE_FROM_CHARS - 1);
    const text = traceText({ method: "M", inputs: [{ name: "a", value: 1, unit: "g", source: atLimit }, { name: "b", value: 2, unit: "g", source: below }] }, () => "[S1]");
    expect(text.split("\n")).toEqual(["Method: M", "a = 1 g — [S1]", `b = 2 g — ${below}`]);
  });

  it("writes sources out in full without a citation function, and reads a trace stored as JSON text", () => {
    const text = traceText(JSON.stringify({ method: "M", source: LONG, inputs: [] }));
    expect(text).toBe(`Method: M — ${LONG}`);
  });

  it("keeps every value of a trace of any other shape", () => {
    expect(traceText({ steps: [{ label: "Class IB volume", value: 12, unit: "L" }], total: { litres: 12.5 } })).toBe("Class IB volume: 12 L\nlitres: 12.5");
  });
});

describe("traceNumber", () => {
  it("rounds to six significant figures and keeps integers and small numbers readable", () => {
    expect(traceNumber(0.21936299999999997)).toBe("0.219363");
    expect(traceNumber(1642.3210102564528)).toBe("1642.32");
    expect(traceNumber(410580)).toBe("410580");
    expect(traceNumber(1.234567e-7)).toBe("1.23457e-7");
    expect(traceNumber(-45.09)).toBe("-45.09");
  });
});

describe("traceText is XML-safe", () => {
  it("drops control characters and carriage returns that came in with stored names", () => {
    const text = traceText({ inputs: [{ name: "Container\u0007 label", symbol: "L", value: "BX-1\r\nopen", unit: "", source: "typed\u0000 in" }] });
    expect(text).not.toMatch(/[\u0000-\u0008\u000B-\u001F]/);
    expect(text).toContain("Container label");
    expect(text).toContain("typed in");
  });
});

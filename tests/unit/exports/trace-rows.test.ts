import { describe, expect, it } from "vitest";
import { traceRows } from "@/lib/exports/trace-rows";

const rows = (trace: unknown) => traceRows(trace);
const brief = (trace: unknown) => rows(trace).map((r) => [r.path, r.label, r.value, r.unit]);

describe("traceRows", () => {
  it("reads an engine trace as method, inputs, steps, result and warnings", () => {
    const trace = {
      method: "Integrated Clausius–Clapeyron",
      source: "OpenStax Chemistry 2e §10.3",
      inputs: [{ name: "Normal boiling point", symbol: "Tb", value: 56.08, unit: "°C", source: "CRC Handbook" }],
      steps: [{ description: "Pressure at T", formula: "ln(P/P0) = −(ΔH/R)(1/T − 1/T0)", substituted: "ln(P/101.325) = …", result: { name: "Saturation vapor pressure", symbol: "Psat", value: 30.6, unit: "kPa" } }],
      result: { name: "Saturation vapor pressure", symbol: "Psat", value: 30.6, unit: "kPa" },
      warnings: ["Antoine range is −10…60 °C; 72 °C is extrapolated"],
    };
    const out = rows(trace);
    expect(out.map((r) => r.label)).toEqual(["Method", "Input: Normal boiling point (Tb)", "Pressure at T", "Result: Saturation vapor pressure (Psat)", "Warning"]);
    expect(out[0]).toMatchObject({ path: "method", formula: "Integrated Clausius–Clapeyron", note: "OpenStax Chemistry 2e §10.3" });
    expect(out[1]).toMatchObject({ path: "inputs[1]", value: 56.08, unit: "°C", note: "CRC Handbook" });
    expect(out[2]).toMatchObject({ path: "steps[1]", formula: "ln(P/P0) = −(ΔH/R)(1/T − 1/T0)", substituted: "ln(P/101.325) = …", value: 30.6, unit: "kPa", note: "Saturation vapor pressure (Psat)" });
    expect(out[4]).toMatchObject({ path: "warnings[1]", note: "Antoine range is −10…60 °C; 72 °C is extrapolated" });
  });

  it("reads simple steps with label, value, unit and formula", () => {
    expect(rows({ method: "Ratio", steps: [{ label: "Psat", value: 58.7, unit: "kPa", formula: "Antoine" }], warnings: [] })).toEqual([
      { path: "method", label: "Method", formula: "Ratio", substituted: null, value: null, unit: null, note: null },
      { path: "steps[1]", label: "Psat", formula: "Antoine", substituted: null, value: 58.7, unit: "kPa", note: null },
    ]);
  });

  it("walks traces nested per scenario and keeps every value with its path", () => {
    const trace = { inControl: { method: "Enclosure bound", steps: [{ label: "C", value: 10, unit: "ppm" }] }, controlLost: { peakPpm: 900, components: [{ name: "ethanol", value: 0.4, unit: "" }] }, note: "both scenarios" };
    expect(brief(trace)).toEqual([
      ["inControl.method", "Method", null, null],
      ["inControl.steps[1]", "C", 10, "ppm"],
      ["controlLost.peakPpm", "peakPpm", 900, null],
      ["controlLost.components[1]", "ethanol", 0.4, null],
      ["note", "note", "both scenarios", null],
    ]);
  });

  it("keeps values as numbers, booleans or text, and parses a trace stored as a JSON string", () => {
    expect(brief('{"boils":true,"list":[1,"two"]}')).toEqual([
      ["boils", "boils", true, null],
      ["list[1]", "list", 1, null],
      ["list[2]", "list", "two", null],
    ]);
    expect(brief("not json")).toEqual([["", "Trace", "not json", null]]);
    expect(rows(null)).toEqual([]);
  });

  it("stops unfolding very deep nesting and shows the rest as JSON", () => {
    let deep: unknown = { leaf: 1 };
    for (let i = 0; i < 40; i++) deep = { d: deep };
    const out = rows(deep);
    expect(out).toHaveLength(1);
    expect(out[0].note).toBe("nested too deeply to unfold; shown as JSON");
    expect(typeof out[0].value).toBe("string");
  });
});

/**
 * The finding page's model of a stored trace (lib/register/trace-steps.ts): number formatting and
 * how each kind of step is recognised, on traces the real rules build for invented locations
 * (tests/unit/assessment/fixtures.ts) with the seeded substance library's data.
 */
import { describe, expect, it } from "vitest";
import { assessLocation, buildMixtureSnapshot, type PlainCandidateFinding } from "@/lib/assessment/rules";
import { traceSaturatedConcentration } from "@/lib/hazard";
import { formatCoefficient, formatTraceNumber, formatTraceValue, traceContainers, traceModel, vaporPressurePoints, type TraceModel } from "@/lib/register/trace-steps";
import { traceText } from "@/lib/register/trace-text";
import { CAS, container, designWorstCase, substance, unitSnapshot } from "../assessment/fixtures";

/**
 * Diethyl ether, 442 mmHg (58.93 kPa) at 20 °C: National Research Council, Prudent Practices in
 * the Laboratory (1995), Laboratory Chemical Safety Summary for diethyl ether (p. 296).
 */
const ETHER_PSAT_20C_KPA = 442 * 0.133322;

/**
 * The seeded ether correlation, VDI Heat Atlas 2nd ed. (2010), D3.1, Wagner 2.5-5 form:
 * ln(P/Pc) = (Tc/T)·(n1·τ + n2·τ^1.5 + n3·τ^2.5 + n4·τ^5), Tc = 466.63 K, Pc = 3651 kPa,
 * n = −7.55709, 2.15613, −3.02766, −2.37858. Worked here at 25 °C: τ = 1 − 298.15/466.63 = 0.36106;
 * the bracket is −2.51252, × 466.63/298.15 = −3.93231 → P = 3651 × e^−3.93231 = 71.55 kPa.
 */
const ETHER_PSAT_25C_TEXT = "71.55 kPa";

describe("formatTraceNumber", () => {
  it("keeps a value stored with up to six significant figures and rounds computed ones to four", () => {
    expect(formatTraceNumber(71.2251333286242)).toBe("71.23");
    expect(formatTraceNumber(0.7029374125696936)).toBe("0.7029");
    expect(formatTraceNumber(24.46540369658722)).toBe("24.47");
    expect(formatTraceNumber(4134.925956292315)).toBe("4135");
    expect(formatTraceNumber(702937.4125696935)).toBe("702,900");
    expect(formatTraceNumber(1782.5)).toBe("1782.5");
    expect(formatTraceNumber(101.325)).toBe("101.325");
    expect(formatTraceNumber(74.123)).toBe("74.123");
    expect(formatTraceNumber(-41.95)).toBe("−41.95");
    expect(formatTraceNumber(0)).toBe("0");
  });

  it("writes ×10ⁿ from 10⁶ up and below 10⁻³", () => {
    expect(formatTraceNumber(2129694.260437304)).toBe("2.13 × 10⁶");
    expect(formatTraceNumber(1_000_000)).toBe("1 × 10⁶");
    expect(formatTraceNumber(0.000123456789)).toBe("1.235 × 10⁻⁴");
  });

  it("shows published coefficients as stored, without float noise", () => {
    expect(formatCoefficient(4.109620000000001)).toBe("4.10962");
    expect(formatCoefficient(1354.913)).toBe("1354.913");
    expect(formatCoefficient(-6954.3)).toBe("−6954.3");
    expect(formatCoefficient(1.6529e-17)).toBe("1.6529 × 10⁻¹⁷");
  });

  it("puts units beside values, temperatures to 0.1 °C and ranges with a true minus", () => {
    expect(formatTraceValue(25, "°C")).toBe("25.0 °C");
    expect(formatTraceValue(-45.12752862729539, "°C")).toBe("−45.1 °C");
    expect(formatTraceValue(71.55374471174727, "kPa")).toBe(ETHER_PSAT_25C_TEXT);
    expect(formatTraceValue("-43.44…55.16", "°C")).toBe("−43.44 to 55.16 °C");
    expect(formatTraceValue(0.7029374125696936, "")).toBe("0.7029");
    expect(formatTraceValue("the largest container", "")).toBe("the largest container");
  });
});

/** Every value text of a model, to check that none is a raw float. */
function texts(model: TraceModel): string[] {
  const out: string[] = [];
  const walk = (v: unknown, key = "") => {
    if (typeof v === "string" && /^(text|concentration|limit|share|sharePercentLfl|sum|saturated|inventory|used|range)$/.test(key)) out.push(v);
    else if (Array.isArray(v)) v.forEach((x) => walk(x));
    else if (v && typeof v === "object") for (const [k, x] of Object.entries(v)) walk(x, k);
  };
  walk(model);
  return out;
}

describe("the vapor-pressure step", () => {
  it("draws diethyl ether at 20 °C within 1 % of the handbook's 58.93 kPa, with the correlation, range and source", () => {
    const ether = substance(CAS.diethylEther);
    const { trace } = traceSaturatedConcentration({ props: ether.props, tempC: 20, substanceName: ether.name, propertySources: ether.sources, tempSource: "design maximum" });
    const model = traceModel({ method: "Rule", inputs: [], steps: [], result: { name: "x", value: 1, unit: "" }, parts: [trace] });
    const [section] = model.parts;
    expect(section.kind).toBe("vapor-pressure");
    const correlation = section.correlation!;
    expect(correlation.name).toBe("Wagner (2.5-5 form)");
    expect(correlation.equation).toBe("ln(P/Pc) = (Tc/T)·(n1·τ + n2·τ^1.5 + n3·τ^2.5 + n4·τ^5), τ = 1 − T/Tc, T in K");
    expect(correlation.coefficients.map((c) => [c.symbol, c.text])).toEqual([
      ["Tc", "466.63 K"],
      ["Pc", "3651 kPa"],
      ["n1", "−7.55709"],
      ["n2", "2.15613"],
      ["n3", "−3.02766"],
      ["n4", "−2.37858"],
    ]);
    expect(correlation.range).toBe("−116.4 to 193.48 °C");
    expect(correlation.inRange).toBe(true);
    // The long citation is listed once and referred to by number.
    expect(correlation.citation).toBe(1);
    expect(model.sources[0]).toMatch(/^VDI Heat Atlas, 2nd ed\. \(Springer 2010\), chapter D3\.1/);
    expect(correlation.temperature?.text).toBe("20.0 °C");
    expect(correlation.temperature?.source).toBe("design maximum");
    expect(correlation.pressureKPa! / ETHER_PSAT_20C_KPA - 1).toBeLessThan(0.01);
    expect(correlation.pressureKPa! / ETHER_PSAT_20C_KPA - 1).toBeGreaterThan(-0.01);
    expect(correlation.pressure?.text).toBe("58.88 kPa");
    // y, ppm, Vm and mg/m³ follow as concentration steps. Worked here: y = 58.885/101.325 = 0.5811;
    // Vm = 8.314462618 × 293.15/101.325 = 24.06 L/mol; 581,100 ppm × 74.123/24.06 = 1.791 × 10⁶ mg/m³.
    expect(section.steps.map((s) => [s.kind, s.result?.text])).toEqual([
      ["vapor-pressure", "58.88 kPa"],
      ["mole-fraction", "0.5811"],
      ["concentration", "581,100 ppm"],
      ["molar-volume", "24.06 L/mol"],
      ["concentration", "1.791 × 10⁶ mg/m³"],
    ]);
    expect(vaporPressurePoints(model)).toEqual([{ title: "Saturated vapor concentration of diethyl ether (wagner)", tempC: 20, pressureKPa: correlation.pressureKPa }]);
  });
});

function finding(list: PlainCandidateFinding[], rule: string, scenario: string, titleStart: string): PlainCandidateFinding {
  const found = list.find((f) => f.rule === rule && f.scenario === scenario && f.title.startsWith(titleStart));
  if (!found) throw new Error(`no ${rule} ${scenario} finding starting "${titleStart}"`);
  return found;
}

describe("an enclosure finding's whole working", () => {
  const ether = substance(CAS.diethylEther);
  const acetone = substance(CAS.acetone);
  // An invented domestic refrigerator of 150 L holding ether and acetone, failed at 25 °C.
  const findings = assessLocation(
    unitSnapshot(
      [
        container(ether, 2.5, "L", "opened", { containerId: 501, label: "DE-1" }),
        container(ether, 1, "L", "sealed", { containerId: 502, label: "DE-2" }),
        container(acetone, 0.5, "L", "opened", { containerId: 503, label: "AC-1" }),
      ],
      { kind: "domestic_refrigerator", ignitionSourceFree: false, internalVolumeL: 150, worstCase: { inControl: designWorstCase(8, "upper end of the set range"), controlLost: designWorstCase(25, "room design maximum") } },
    ),
  ).map((f) => f.toPlain());

  it("draws the bound, the correlation with Psat at 25 °C, the LFL share and the severity", () => {
    const ether25 = finding(findings, "enclosure-lfl", "control_lost", "Diethyl ether");
    const model = traceModel(JSON.stringify(ether25.trace));
    expect(model.parts.map((p) => p.kind)).toEqual(["enclosure-bound", "lfl-fraction"]);
    const [bound, lfl] = model.parts;
    expect(bound.correlation?.pressure?.text).toBe(ETHER_PSAT_25C_TEXT);
    expect(bound.correlation?.temperature?.text).toBe("25.0 °C");
    expect(bound.bound).toEqual({ saturated: "706,200 ppm", inventory: "1 × 10⁶ ppm", used: "706,200 ppm", limitedBy: "saturation" });
    expect(lfl.shares).toEqual({
      rows: [{ name: "diethyl ether", concentration: "706,200 ppm", limit: "1.7 % by volume", share: "41.54", sharePercentLfl: "4154 % LFL" }],
      sum: "41.54",
    });
    expect(model.rule?.steps.map((s) => [s.kind, s.severity])).toEqual([["severity", "critical"]]);
    expect(model.rule?.result?.text).toBe("4154 % LFL");
    expect(model.containers.map((c) => [c.label, c.content, c.amountText, c.state])).toEqual([
      ["DE-1", "diethyl ether", "2.5 L", "open"],
      ["DE-2", "diethyl ether", "1 L", "sealed"],
    ]);
    for (const text of texts(model)) expect(text).not.toMatch(/\d[.,]?\d{7,}/);
  });

  it("lists every open container of the all-together finding and sums each substance's share", () => {
    const together = finding(findings, "enclosure-lfl", "control_lost", "Open containers");
    expect(traceContainers(together.trace).map((c) => c.label)).toEqual(["DE-1", "AC-1"]);
    const model = traceModel(together.trace);
    expect(model.parts.filter((p) => p.kind === "vapor-pressure").map((p) => p.correlation?.name)).toEqual(["Wagner (2.5-5 form)", "Wagner (2.5-5 form)"]);
    const lfl = model.parts.find((p) => p.kind === "lfl-fraction")!;
    expect(lfl.shares?.rows.map((r) => r.name)).toEqual(["diethyl ether", "acetone"]);
    expect(lfl.shares?.sum).toBe(model.rule?.steps.length ? formatTraceNumber(together.ratio!) : null);
  });

  it("draws a mixture by Raoult's law from each component's own vapor pressure, and Le Chatelier's mixing rule", () => {
    const mix = buildMixtureSnapshot({ id: 9, name: "Ether–acetone 1:1", fractionBasis: "mole", components: [{ substance: ether, fraction: 0.5 }, { substance: acetone, fraction: 0.5 }] });
    const [mixture] = assessLocation(unitSnapshot([container({ kind: "mixture", mixture: mix }, 1, "L", "opened", { containerId: 601, label: "MX-1" })], { kind: "domestic_refrigerator", ignitionSourceFree: false, internalVolumeL: 150 }))
      .map((f) => f.toPlain())
      .filter((f) => f.rule === "enclosure-lfl" && f.scenario === "in_control");
    const model = traceModel(mixture.trace);
    expect(model.parts.map((p) => p.kind)).toEqual(["vapor-pressure", "vapor-pressure", "raoult", "lfl-fraction", "le-chatelier"]);
    const raoult = model.parts[2];
    expect(raoult.table?.head).toEqual(["Substance", "Liquid mole fraction (xᵢ)", "Pᵢsat", "pᵢ = xᵢ·Pᵢsat"]);
    // Psat of each component at 8 °C (the unit's worst case in control) is the one its own part drew.
    expect(raoult.table?.rows.map((r) => [r[0], r[1], r[2]])).toEqual([
      ["diethyl ether", "0.5", model.parts[0].correlation?.pressure?.text],
      ["acetone", "0.5", model.parts[1].correlation?.pressure?.text],
    ]);
    expect(model.parts[4].table?.rows.map((r) => r[0])).toEqual(["diethyl ether", "acetone"]);
    expect(model.containers.map((c) => c.label)).toEqual(["MX-1"]);
  });

  it("prints one workbook line per contributing container", () => {
    const ether25 = finding(findings, "enclosure-lfl", "control_lost", "Diethyl ether");
    const lines = traceText(ether25.trace).split("\n");
    expect(lines.filter((l) => l.startsWith("Contributing container"))).toEqual([
      "Contributing container: DE-1 — diethyl ether, 2.5 L, opened",
      "Contributing container: DE-2 — diethyl ether, 1 L, sealed",
    ]);
    expect(lines.some((l) => l.includes("containerId"))).toBe(false);
  });
});

describe("a trace of another shape", () => {
  it("keeps every stored value as a row", () => {
    const model = traceModel({ steps: [{ label: "Psat", value: 58.7, unit: "kPa" }], total: { litres: 12.5 } });
    expect(model.rule).toBeNull();
    expect(model.other).toEqual([
      { label: "Psat", text: "58.7 kPa" },
      { label: "total · litres", text: "12.5" },
    ]);
    expect(traceModel(null)).toEqual({ rule: null, parts: [], containers: [], other: [], sources: [] });
  });
});

import { describe, expect, it } from "vitest";
import { assessLocation, buildMixtureSnapshot, createAssessmentCache, RULE_IDS, type LocationSnapshot } from "@/lib/assessment/rules";
import { CAS, container, designWorstCase, roomSnapshot, substance, substanceWith, unitSnapshot } from "./fixtures";

describe("assessLocation", () => {
  const ether = substance(CAS.diethylEther);
  const acetone = substance(CAS.acetone);

  it("runs every rule of a refrigerator under both scenarios (the classic: ether in a domestic refrigerator)", () => {
    const findings = assessLocation(
      unitSnapshot([container(ether, 0.5, "L", "opened"), container(acetone, 1, "L", "opened"), container(substance(CAS.water), 1)], {
        kind: "domestic_refrigerator",
        ignitionSourceFree: false,
        code: "DF-2",
        worstCase: { inControl: designWorstCase(6), controlLost: null },
      }),
    );
    const summary = findings.map((f) => `${f.rule} ${f.scenario} ${f.severity}`).sort();
    expect(summary).toEqual(
      [
        "enclosure-lfl control_lost critical", // ether
        "enclosure-lfl control_lost critical", // acetone
        "enclosure-lfl control_lost critical", // both open containers
        "enclosure-lfl in_control critical",
        "enclosure-lfl in_control critical",
        "enclosure-lfl in_control critical",
        "flash-point control_lost moderate",
        "flash-point control_lost moderate",
        "flash-point in_control moderate",
        "flash-point in_control moderate",
        "ignition-source-unit in_control critical",
        "ignition-source-unit in_control critical",
      ].sort(),
    );
  });

  it("a unit without temperature control is assessed once, at its own worst case or its room's", () => {
    const findings = assessLocation(unitSnapshot([container(acetone, 1)], { kind: "flammable_cabinet", setRange: null, worstCase: { inControl: null, controlLost: null } }, { worstCase: designWorstCase(28) }));
    expect(new Set(findings.map((f) => f.scenario))).toEqual(new Set(["in_control"]));
    const flash = findings.find((f) => f.rule === "flash-point");
    expect(flash?.worstCaseTempC).toBe(28);
    expect(flash?.worstCaseSource).toBe("28.0 °C, design maximum (the room's worst case; the unit has none of its own)");
  });

  it("control lost is never assessed below the unit's own worst case", () => {
    const findings = assessLocation(unitSnapshot([container(acetone, 1)], { worstCase: { inControl: designWorstCase(30), controlLost: null } }, { worstCase: designWorstCase(22) }));
    expect(findings.find((f) => f.rule === "flash-point" && f.scenario === "control_lost")?.worstCaseTempC).toBe(30);
  });

  it("leaves empty and disposed containers out", () => {
    expect(assessLocation(unitSnapshot([container(ether, 1, "L", "empty"), container(ether, 1, "L", "disposed"), container(ether, 0, "L", "opened")]))).toEqual([]);
  });

  it("gives the same findings with a shared cache as without, and the same on every run", () => {
    const snapshot = unitSnapshot([container(ether, 0.2, "L", "opened"), container(acetone, 2)], { worstCase: { inControl: designWorstCase(5), controlLost: null } });
    const cache = createAssessmentCache();
    const a = JSON.stringify(assessLocation(snapshot));
    assessLocation(unitSnapshot([container(ether, 3)]), undefined, { cache });
    const b = JSON.stringify(assessLocation(snapshot, undefined, { cache }));
    expect(b).toBe(a);
    expect(JSON.stringify(assessLocation(snapshot))).toBe(a);
  });
});

describe("finding traces", () => {
  const findings = assessLocation(unitSnapshot([container(substance(CAS.diethylEther), 10, "mL", "opened")], { worstCase: { inControl: designWorstCase(4), controlLost: null } }));
  const enclosure = findings.find((f) => f.rule === "enclosure-lfl") as (typeof findings)[number];

  it("keep the engine's traces unchanged in parts and add the rule's own step with the thresholds used", () => {
    const { trace } = enclosure;
    expect(trace.rule).toBe("enclosure-lfl");
    expect(trace.scenario).toBe("in_control");
    expect(trace.parts.map((part) => part.method)).toEqual(["Closed-enclosure bound", "Fraction of the lower flammable limit"]);
    const severityStep = trace.steps.at(-1);
    expect(severityStep?.formula).toBe("f ≥ 1 → critical; f ≥ 0.25 → high; f ≥ 0.1 → moderate");
    expect(severityStep?.substituted).toBe("f = 0.4601 ≥ 0.25 → high");
    expect(severityStep?.result.value).toBe("high");
    expect(severityStep?.result.source).toMatch(/^Default, set by your organisation\./);
    expect(trace.inputs[0]).toEqual({ name: "Worst-case temperature", symbol: "T", value: 4, unit: "°C", source: "4.0 °C, design maximum" });
    expect(trace.result).toEqual({ name: "Fraction of the LFL", symbol: "f", value: enclosure.value, unit: "% LFL" });
  });

  it("are plain JSON, built once and included when a finding is serialised or copied with toPlain()", () => {
    expect(enclosure.trace).toBe(enclosure.trace);
    expect(JSON.parse(JSON.stringify(enclosure.trace))).toEqual(enclosure.trace);
    const serialised = JSON.parse(JSON.stringify(enclosure));
    expect(serialised.trace).toEqual(enclosure.trace);
    expect(serialised.fingerprint).toBe(enclosure.fingerprint);
    expect(enclosure.toPlain().trace).toBe(enclosure.trace);
    expect(Object.keys(enclosure.toPlain())).toEqual([
      "fingerprint",
      "rule",
      "severity",
      "scenario",
      "title",
      "siteId",
      "roomId",
      "storageUnitId",
      "containerId",
      "substanceId",
      "mixtureId",
      "value",
      "limitValue",
      "ratio",
      "unit",
      "worstCaseTempC",
      "worstCaseSource",
      "timeToDanger",
      "trace",
      "containerIds",
    ]);
  });

  it("every finding of every rule has a trace with a method, a source and a severity or missing-data step", () => {
    for (const finding of findings) {
      expect(finding.trace.method.length).toBeGreaterThan(0);
      expect(finding.trace.source.length).toBeGreaterThan(0);
      expect(finding.trace.steps.length).toBeGreaterThan(0);
    }
  });
});

describe("every trace can be built", () => {
  it("for units, rooms, spills of pure liquids and mixtures, cryogens, dry ice and missing data alike", () => {
    const acetoneEthanol = buildMixtureSnapshot({
      id: 21,
      name: "acetone–ethanol rinse",
      fractionBasis: "mass",
      components: [
        { substance: substance(CAS.acetone), fraction: 0.6 },
        { substance: substance(CAS.ethanol), fraction: 0.4 },
      ],
    });
    // A component without any vapor-pressure method is left out of the mixture (and reported).
    const withGap = buildMixtureSnapshot({
      id: 22,
      name: "hexane with an unknown",
      fractionBasis: "mole",
      components: [
        { substance: substance(CAS.nHexane), fraction: 0.7 },
        { substance: substanceWith(CAS.toluene, { id: 990, correlations: [], normalBoilingPointC: null }), fraction: 0.3 },
      ],
    });
    const mixtures = [container({ kind: "mixture", mixture: acetoneEthanol }, 10, "L", "opened"), container({ kind: "mixture", mixture: withGap }, 2.5, "L", "in_use")];
    const pure = [container(substance(CAS.diethylEther), 1, "L", "opened"), container(substance(CAS.acetone), 20), container(substance(CAS.nButanol), 1, "L", "opened")];
    const snapshots: LocationSnapshot[] = [
      unitSnapshot([...pure, ...mixtures], { kind: "domestic_refrigerator", ignitionSourceFree: false }),
      unitSnapshot([...pure, ...mixtures, ...Array.from({ length: 60 }, () => container(substance(CAS.acetone), 4))], { kind: "flammable_cabinet", setRange: null }),
      roomSnapshot([...pure, ...mixtures]),
      roomSnapshot([...pure, ...mixtures], { airChangesPerHour: 0, kind: "cold_room", worstCase: designWorstCase(10) }),
      roomSnapshot(
        [container(substance(CAS.nitrogen), 50), container(substance(CAS.carbonDioxide), 10, "kg"), container(substance(CAS.carbonDioxide), 2, "L"), ...pure],
        { volumeM3: 40, worstCase: designWorstCase(22) },
      ),
      unitSnapshot(pure, { worstCase: { inControl: null, controlLost: null }, internalVolumeL: null }, { worstCase: null, volumeM3: null }),
      unitSnapshot([...pure, ...mixtures], { kind: "open_shelving", setRange: null, worstCase: { inControl: designWorstCase(70), controlLost: null } }),
    ];
    const rules = new Set<string>();
    for (const snapshot of snapshots) {
      for (const finding of assessLocation(snapshot)) {
        rules.add(finding.rule);
        const trace = JSON.parse(JSON.stringify(finding.trace));
        expect(trace.rule).toBe(finding.rule);
        expect(trace.steps.length).toBeGreaterThan(0);
        for (const part of trace.parts) expect(part.steps.length).toBeGreaterThan(0);
      }
    }
    expect([...rules].sort()).toEqual([...RULE_IDS].sort());
  });

  it("a spilled mixture is compared by the additive exposure index Σ Cᵢ/Lᵢ (OSHA 29 CFR 1910.1000(d)(2)(i))", () => {
    const rinse = buildMixtureSnapshot({
      id: 23,
      name: "acetone–ethanol rinse",
      fractionBasis: "mass",
      components: [
        { substance: substance(CAS.acetone), fraction: 0.6 },
        { substance: substance(CAS.ethanol), fraction: 0.4 },
      ],
    });
    const finding = assessLocation(roomSnapshot([container({ kind: "mixture", mixture: rinse }, 20)])).find((f) => f.rule === "spill-exposure");
    expect(finding?.unit).toBe("index");
    expect(finding?.limitValue).toBe(1);
    expect(finding?.mixtureId).toBe(23);
    // The engine's additive index for the controlling kind of limit is the finding's value.
    const value = finding?.value as number;
    const indices = finding?.trace.parts.filter((part) => part.method === "Additive mixture rule") ?? [];
    expect(indices.length).toBeGreaterThan(0);
    expect(indices.some((part) => Math.abs((part.result.value as number) / value - 1) < 1e-9)).toBe(true);
  });
});

/**
 * The thresholds a warming unit is projected against: every severity threshold its contents cross
 * on the way from in control to control lost (time-to-danger.ts), named as people name them.
 */
import type { Severity } from "@/db/enums";
import { assessLocation } from "./assess";
import type { Finding } from "./context";
import { severityRank } from "./severity";
import type { AssessmentSettings, LocationSnapshot } from "./types";

/** What a unit's contents are, as people name them in a warning ("diethyl ether", "open containers together"). */
function subjectName(snapshot: LocationSnapshot, finding: Finding): string {
  if (finding.substanceId !== null) {
    for (const c of snapshot.contents) if (c.content.kind === "substance" && c.content.substance.id === finding.substanceId) return c.content.substance.name;
  }
  if (finding.mixtureId !== null) {
    for (const c of snapshot.contents) if (c.content.kind === "mixture" && c.content.mixture.id === finding.mixtureId) return c.content.mixture.name;
  }
  return "open containers together";
}

export type UnitThreshold = {
  /** The control-lost finding's fingerprint with the threshold, for "once per excursion and threshold". */
  key: string;
  name: string;
  rule: string;
  severity: Severity;
  threshold: string;
  tempC: number;
};

/**
 * Every severity threshold the contents of a temperature-controlled unit cross on the way from in
 * control to control lost, lowest temperature first: what a warming unit is projected against.
 */
export function unitThresholds(snapshot: LocationSnapshot, settings: AssessmentSettings): UnitThreshold[] {
  if (snapshot.kind !== "unit") return [];
  const out: UnitThreshold[] = [];
  for (const finding of assessLocation(snapshot, settings) as Finding[]) {
    if (finding.scenario !== "control_lost" || finding.thresholdTemps === null) continue;
    const name = subjectName(snapshot, finding);
    for (const t of finding.thresholdTemps) {
      out.push({ key: `${finding.fingerprint}|${t.threshold}`, name, rule: finding.rule, severity: t.severity, threshold: t.threshold, tempC: t.tempC });
    }
  }
  return out.sort((a, b) => a.tempC - b.tempC || severityRank(b.severity) - severityRank(a.severity));
}

/**
 * Which findings standing at a place concern what would be stored there: the substance or mixture
 * itself, or a group it takes part in (a mixture holding it, open containers together, a quantity
 * limit of its class, the cryogen inventory). Pure: shared by the what-if and the storage planner.
 */
import type { Severity } from "@/db/enums";
import { severityRank, subjectKey, type AssessmentSettings, type StoredContent } from "./rules";

export type Relatedness = "substance" | "group";

/** The subject part of a fingerprint ("rule|location|subject|scenario"), e.g. "substance:7", "open-containers", "limit:3". */
export function subjectOf(fingerprint: string): string {
  const first = fingerprint.indexOf("|");
  const second = first < 0 ? -1 : fingerprint.indexOf("|", first + 1);
  if (second < 0) return "";
  const third = fingerprint.indexOf("|", second + 1);
  return fingerprint.slice(second + 1, third < 0 ? undefined : third);
}

/** The substances a stored content is made of (one, or a mixture's components). */
export function substanceIdsOf(content: StoredContent | null): Set<number> {
  if (content?.kind === "substance") return new Set([content.substance.id]);
  if (content?.kind === "mixture") return new Set(content.mixture.components.map((c) => c.substance.id));
  return new Set();
}

/**
 * A classifier of standing findings for one content: "substance" when the finding is about it,
 * "group" when it takes part, null otherwise. `components` gives each mixture's substances for
 * the findings about mixtures.
 */
export function relatedTo(
  content: StoredContent | null,
  mixtureId: number | null,
  settings: AssessmentSettings,
  components: ReadonlyMap<number, ReadonlySet<number>>,
): (finding: { fingerprint: string; substanceId: number | null; mixtureId: number | null }) => Relatedness | null {
  const substanceIds = substanceIdsOf(content);
  const flammable = content?.kind === "substance" ? content.substance.lflVolPercent != null : (content?.mixture.components.some((c) => c.substance.lflVolPercent != null) ?? false);
  const liquidClass = content?.kind === "substance" ? content.substance.nfpaClass : (content?.mixture.nfpaClass ?? null);
  const cold = content?.kind === "substance" && (content.substance.physicalState === "cryogen" || content.substance.physicalState === "solid");
  const limitClasses = new Map(settings.quantities.limits.map((l) => [subjectKey({ kind: "quantity-limit", id: l.id }), l.liquidClasses as readonly string[]]));
  return (f) => {
    const subject = subjectOf(f.fingerprint);
    if (subject === "open-containers") return flammable || (f.substanceId != null && substanceIds.has(f.substanceId)) ? "group" : null;
    if (subject.startsWith("limit:")) return liquidClass != null && (limitClasses.get(subject)?.includes(liquidClass) ?? true) ? "group" : null;
    if (subject === "cryogen-inventory" || subject === "dry-ice") return cold ? "group" : null;
    if (f.substanceId != null && substanceIds.has(f.substanceId)) return "substance";
    if (f.mixtureId != null && f.mixtureId === mixtureId) return "substance";
    if (f.mixtureId != null && [...(components.get(f.mixtureId) ?? [])].some((id) => substanceIds.has(id))) return "group";
    return null;
  };
}

/** A ratio that moves by less than 1 % has not changed: the same state assessed twice may differ in the last digits. */
const RATIO_CHANGE_FACTOR = 1.01;

/** Whether a finding after a change is worse than before it: a higher severity or a ratio higher by more than 1 %. */
export function worse(after: { severity: Severity; ratio: number | null }, before: { severity: Severity; ratio: number | null }): boolean {
  return severityRank(after.severity) > severityRank(before.severity) || (after.ratio ?? 0) > (before.ratio ?? 0) * RATIO_CHANGE_FACTOR;
}

/** Whether a finding after a change is better than before it: a lower severity or a ratio lower by more than 1 %. */
export function better(after: { severity: Severity; ratio: number | null }, before: { severity: Severity; ratio: number | null }): boolean {
  return severityRank(after.severity) < severityRank(before.severity) || (after.ratio ?? 0) * RATIO_CHANGE_FACTOR < (before.ratio ?? 0);
}

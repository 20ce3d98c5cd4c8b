/**
 * A finding's fingerprint: the same rule at the same location about the same thing under the same
 * scenario gives the same string on every re-assessment, so the register finds its row again
 * (and a changed value updates it instead of raising a second finding). The fingerprint is the
 * canonical string itself — readable in the database and free of collisions — e.g.
 * "enclosure-lfl|unit:12|substance:5|control_lost".
 */
import type { Scenario } from "@/db/enums";
import type { RuleId } from "./rule-ids";

export type LocationRef = { readonly kind: "room" | "unit"; readonly id: number };

/** What a finding is about, within its location. */
export type FindingSubject =
  | { readonly kind: "substance"; readonly id: number }
  | { readonly kind: "mixture"; readonly id: number }
  | { readonly kind: "container"; readonly id: number }
  | { readonly kind: "quantity-limit"; readonly id: number | string }
  /** A location-wide subject, e.g. "open-containers" or "inventory". */
  | { readonly kind: "location"; readonly key: string };

function part(text: string): string {
  // Keep the separators unambiguous whatever an id or key contains.
  return text.replace(/[|%]/g, (ch) => (ch === "|" ? "%7C" : "%25"));
}

export function locationKey(location: LocationRef): string {
  return `${location.kind}:${location.id}`;
}

export function subjectKey(subject: FindingSubject): string {
  switch (subject.kind) {
    case "substance":
    case "mixture":
    case "container":
      return `${subject.kind}:${subject.id}`;
    case "quantity-limit":
      return `limit:${part(String(subject.id))}`;
    default:
      return part(subject.key);
  }
}

/**
 * rule | location | subject[/detail] | scenario. `detail` tells apart findings of one rule about
 * the same subject, e.g. the kind of missing data ("substance:5/no-lfl").
 */
export function findingFingerprint(input: {
  rule: RuleId;
  location: LocationRef;
  subject: FindingSubject;
  scenario: Scenario;
  detail?: string;
}): string {
  const subject = input.detail ? `${subjectKey(input.subject)}/${part(input.detail)}` : subjectKey(input.subject);
  return `${input.rule}|${locationKey(input.location)}|${subject}|${input.scenario}`;
}

/**
 * The what-if's verdict in one or two plain sentences: whether storing something raises a finding,
 * whether the place is already flagged for it (storing more does not make a flagged place safe),
 * or whether nothing about it is flagged there. Pure: the preview service gathers the facts.
 */
import type { Severity } from "@/db/enums";

export const PREVIEW_VERDICTS = ["raises", "already_flagged", "no_findings"] as const;
export type PreviewVerdict = (typeof PREVIEW_VERDICTS)[number];

/** "store": a new container; "edit": a stored container changed where it stands; "move": a stored container moved as it is. */
export type PreviewMode = "store" | "edit" | "move";

/** What the change does to a finding standing in the register. */
export type CurrentOutcome = "unchanged" | "worse" | "better" | "cleared";

export type VerdictFacts = {
  mode: PreviewMode;
  /** The target unit's code, e.g. "FR-1". */
  unitCode: string;
  /** What is stored, as the library names it ("diethyl ether"). */
  contentName: string;
  /** New or worse findings, worst first. */
  raised: readonly { severity: Severity; title: string; isNew: boolean; previous: { severity: Severity } | null }[];
  /** Findings standing at the unit (and its room's own) about the same substance or its group, worst first. */
  current: readonly { severity: Severity; title: string; outcome: CurrentOutcome }[];
  /** Standing findings at the unit about other contents. */
  otherStandingCount: number;
  /** For a move: the findings at the old place that the move would clear, worst first. */
  cleared: readonly { severity: Severity; title: string }[];
  sourceUnitCode: string | null;
};

const VERB: Record<PreviewMode, string> = { store: "Storing this here", edit: "Saving these changes", move: "Moving it here" };
const KEEPS: Record<PreviewMode, string> = { store: "Storing more keeps it so.", edit: "Saving these changes keeps it so.", move: "Moving it here keeps it so." };

const plural = (n: number, one: string, many = `${one}s`) => (n === 1 ? one : many);

/**
 * A finding's title inside a sentence: the library's own lower-case name where the title
 * capitalised it ("Diethyl ether in FR-1 …" → "diethyl ether in FR-1 …"), without a final stop.
 */
export function titleInSentence(title: string, names: readonly string[]): string {
  const text = title.trim().replace(/\.$/, "");
  for (const name of [...names, "open containers"]) {
    if (!name) continue;
    const capitalised = name[0].toUpperCase() + name.slice(1);
    if (capitalised !== name && text.startsWith(capitalised)) return name + text.slice(name.length);
  }
  return text;
}

export function previewVerdict(facts: Pick<VerdictFacts, "raised" | "current">): PreviewVerdict {
  if (facts.raised.length > 0) return "raises";
  if (facts.current.some((f) => f.outcome !== "cleared")) return "already_flagged";
  return "no_findings";
}

/** The verdict's sentence (see the examples in tests/unit/assessment/preview-verdict.test.ts). */
export function verdictSentence(facts: VerdictFacts): string {
  const names = [facts.contentName];
  const verdict = previewVerdict(facts);
  const standing = facts.current.filter((f) => f.outcome !== "cleared");
  const parts: string[] = [];
  if (verdict === "raises") {
    const first = facts.raised[0];
    const title = titleInSentence(first.title, names);
    if (first.isNew || !first.previous) parts.push(`${VERB[facts.mode]} would raise a new ${first.severity} finding: ${title}.`);
    else if (first.previous.severity !== first.severity) parts.push(`${VERB[facts.mode]} would make a ${first.previous.severity} finding ${first.severity}: ${title}.`);
    else parts.push(`${VERB[facts.mode]} would make a ${first.severity} finding worse: ${title}.`);
    const more = facts.raised.length - 1;
    if (more > 0) parts.push(`${more} more would be new or worse.`);
    const unchanged = standing.filter((f) => f.outcome !== "worse").length;
    if (unchanged > 0) parts.push(`${unchanged} ${plural(unchanged, "finding")} about ${facts.contentName} ${plural(unchanged, "is", "are")} already open here.`);
  } else if (verdict === "already_flagged") {
    const worst = standing[0];
    parts.push(`Already ${worst.severity} here: ${titleInSentence(worst.title, names)}.`, KEEPS[facts.mode]);
    const others = standing.length - 1;
    if (others > 0) parts.push(`${others} other open ${plural(others, "finding")} here ${plural(others, "concerns", "concern")} ${facts.contentName} too.`);
  } else {
    const cleared = facts.current.length;
    if (cleared > 0) parts.push(`${VERB[facts.mode]} would raise no finding and would clear the ${cleared === 1 ? "one" : cleared} open at ${facts.unitCode} about ${facts.contentName}.`);
    else parts.push(`${VERB[facts.mode]} would raise no finding, and none is open at ${facts.unitCode} about ${facts.contentName}.`);
    const others = facts.otherStandingCount;
    if (others > 0) parts.push(`${others} open ${plural(others, "finding")} at ${facts.unitCode} or in its room ${plural(others, "concerns", "concern")} other contents.`);
  }
  if (facts.mode === "move" && facts.cleared.length > 0 && facts.sourceUnitCode) {
    const worst = facts.cleared[0];
    parts.push(
      facts.cleared.length === 1
        ? `Moving it out clears a ${worst.severity} finding at ${facts.sourceUnitCode}: ${titleInSentence(worst.title, names)}.`
        : `Moving it out clears ${facts.cleared.length} findings at ${facts.sourceUnitCode}, the worst ${worst.severity}.`,
    );
  }
  return parts.join(" ");
}

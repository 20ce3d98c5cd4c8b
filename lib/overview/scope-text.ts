/**
 * What the Overview says, in the words of each reader's own scope: a researcher hears about their
 * containers, facilities staff about their rooms and units, safety officers and administrators
 * about the whole register, auditors read figures. A sentence that covers only a person's own
 * scope never reads as if the whole institution were clear. Pure.
 */
import type { Role } from "@/lib/auth/roles";
import { formatCount } from "@/lib/format/numbers";

export type OverviewAudience = "register" | "auditor" | "researcher" | "facilities";

/** The audience of a role with its scope of the register (null: it may not read the register). */
export function overviewAudience(role: Role, findingScope: "all" | "own" | null): OverviewAudience {
  if (findingScope === "all") return role === "auditor" ? "auditor" : "register";
  return role === "researcher" ? "researcher" : "facilities";
}

/** "of yours", "in your rooms and units", or nothing for the whole register. */
export const SCOPE_WORDS: Record<OverviewAudience, { findings: string; place: string | null; heading: string }> = {
  register: { findings: "", place: null, heading: "Needs attention" },
  auditor: { findings: "", place: null, heading: "Open findings and excursions" },
  researcher: { findings: " on your containers", place: "your containers and the storage units you own", heading: "Needs attention: your containers and units" },
  facilities: { findings: " in your rooms and units", place: "the rooms you are the contact for and the storage units you own", heading: "Needs attention: your rooms and units" },
};

export type HeadlineFigures = {
  /** Open findings (open, acknowledged, mitigating) in the reader's scope. */
  urgent: number;
  totalOpen: number;
  /** Open excursions in the reader's scope (0 for a role that does not read temperatures). */
  openExcursions: number;
  /** How many containers, rooms or units the reader is responsible for (researchers, facilities). */
  responsibleFor: number;
  /** Open findings a researcher's containers add to that the register records on others' containers. */
  contributedElsewhere?: number;
};

const plural = (n: number, one: string, other: string) => `${formatCount(n)} ${n === 1 ? one : other}`;

/** The Overview's one-line summary for a reader. */
export function overviewHeadline(audience: OverviewAudience, figures: HeadlineFigures): string {
  const { urgent, totalOpen, openExcursions } = figures;
  const scoped = SCOPE_WORDS[audience].findings;
  if (audience === "auditor") {
    const findings = totalOpen === 0 ? "The register holds no open findings" : `The register holds ${plural(totalOpen, "open finding", "open findings")}, ${formatCount(urgent)} of them critical or high`;
    const excursions = openExcursions === 0 ? "no temperature excursion is open" : `${plural(openExcursions, "temperature excursion is", "temperature excursions are")} open`;
    return `${findings}; ${excursions}.`;
  }
  if (urgent > 0) return `${plural(urgent, "critical or high finding", "critical or high findings")}${scoped} need${urgent === 1 ? "s" : ""} attention.`;
  if (openExcursions > 0) return `${plural(openExcursions, "temperature excursion", "temperature excursions")}${scoped} ${openExcursions === 1 ? "is" : "are"} still open.`;
  if (totalOpen > 0) return `No critical or high findings${scoped}; ${plural(totalOpen, "lower-severity finding is", "lower-severity findings are")} open.`;
  if (audience === "register") return "Nothing in the register needs attention right now.";
  if (audience === "researcher") {
    const elsewhere = figures.contributedElsewhere ?? 0;
    if (elsewhere > 0) {
      return `None of your own findings is open, but your containers add to ${plural(elsewhere, "open finding", "open findings")} recorded on other people's containers.`;
    }
    return figures.responsibleFor === 0
      ? "You have no containers or storage units of your own yet, so nothing in the register is yours."
      : "Nothing of yours needs attention right now.";
  }
  return figures.responsibleFor === 0
    ? "You are not the contact for any room and own no storage unit, so nothing in the register is yours."
    : "Nothing in your rooms and units needs attention right now.";
}

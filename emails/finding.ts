import { renderEmail, type RenderedEmail } from "./layout";

export type FindingEmailInput = {
  event: "raised" | "reopened" | "escalated";
  severity: string;
  title: string;
  locationLabel: string;
  valueText: string | null;
  worstCaseText: string | null;
  link: string;
};

const LEAD = {
  raised: "A new finding has been raised in the register",
  reopened: "A finding has re-opened: its condition holds again",
  escalated: "A finding has become more severe",
} as const;

export function findingEmail(input: FindingEmailInput): RenderedEmail {
  const severity = input.severity.toUpperCase();
  return renderEmail(`${severity} finding: ${input.title}`, `${severity}: ${input.title}`, [
    { kind: "p", text: `${LEAD[input.event]} for ${input.locationLabel}.` },
    ...(input.valueText ? [{ kind: "p" as const, text: input.valueText }] : []),
    ...(input.worstCaseText ? [{ kind: "p" as const, text: `Worst-case temperature used: ${input.worstCaseText}.` }] : []),
    { kind: "button", label: "Open the finding", href: input.link },
    {
      kind: "small",
      text: "A screening estimate from the inventory, substance data and temperatures, not air monitoring. Qualified people decide what to do, and local codes and the authority having jurisdiction prevail.",
    },
  ]);
}

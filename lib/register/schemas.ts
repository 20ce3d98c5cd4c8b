/** The register's workflow steps, one schema shared by the finding page's forms and the API. */
import { z } from "zod";
import { optionalDate, optionalText, requiredId, requiredText } from "@/lib/validation/fields";

export const MAX_RISK_ACCEPTANCE_DAYS = 3 * 366;

const reviewDate = optionalDate("Review date").refine((v) => v != null, "A review date is required when accepting a risk.");

export const findingEventSchema = z.discriminatedUnion(
  "kind",
  [
    z.object({ kind: z.literal("acknowledge"), note: optionalText("Note", 2000) }),
    z.object({ kind: z.literal("start_mitigation"), plan: requiredText("Mitigation plan", 4000), assigneeId: requiredId("person to own the mitigation") }),
    z.object({ kind: z.literal("resolve"), note: requiredText("Resolution note", 4000) }),
    z.object({ kind: z.literal("accept_risk"), justification: requiredText("Justification", 4000), reviewDate }),
    z.object({ kind: z.literal("comment"), note: requiredText("Comment", 4000) }),
    z.object({ kind: z.literal("assign"), assigneeId: requiredId("person") }),
    z.object({ kind: z.literal("reopen"), note: requiredText("Reason", 4000) }),
  ],
  { error: "kind must be one of acknowledge, start_mitigation, resolve, accept_risk, comment, assign, reopen." },
);
export type FindingEventInput = z.output<typeof findingEventSchema>;
export const FINDING_EVENT_INPUT_KINDS = ["acknowledge", "start_mitigation", "resolve", "accept_risk", "comment", "assign", "reopen"] as const;

/** The register's workflow steps, one schema shared by the finding page's forms and the API. */
import { z } from "zod";
import { FINDING_STATUSES, SCENARIOS, SEVERITIES } from "@/db/enums";
import { listQuerySchema } from "@/lib/http/list-query";
import { optionalDate, optionalText, requiredId, requiredText } from "@/lib/validation/fields";

export const MAX_RISK_ACCEPTANCE_DAYS = 3 * 366;

const reviewDate = optionalDate("Review date").refine((v) => v != null, "A review date is required when accepting a risk.");

/** Each workflow step on its own (the finding page has one small form per step). */
export const FINDING_STEP_SCHEMAS = {
  acknowledge: z.object({ kind: z.literal("acknowledge"), note: optionalText("Note", 2000) }),
  start_mitigation: z.object({ kind: z.literal("start_mitigation"), plan: requiredText("Mitigation plan", 4000), assigneeId: requiredId("person to own the mitigation") }),
  resolve: z.object({ kind: z.literal("resolve"), note: requiredText("Resolution note", 4000) }),
  accept_risk: z.object({ kind: z.literal("accept_risk"), justification: requiredText("Justification", 4000), reviewDate }),
  comment: z.object({ kind: z.literal("comment"), note: requiredText("Comment", 4000) }),
  assign: z.object({ kind: z.literal("assign"), assigneeId: requiredId("person") }),
  reopen: z.object({ kind: z.literal("reopen"), note: requiredText("Reason", 4000) }),
} as const;

export const findingEventSchema = z.discriminatedUnion(
  "kind",
  [
    FINDING_STEP_SCHEMAS.acknowledge,
    FINDING_STEP_SCHEMAS.start_mitigation,
    FINDING_STEP_SCHEMAS.resolve,
    FINDING_STEP_SCHEMAS.accept_risk,
    FINDING_STEP_SCHEMAS.comment,
    FINDING_STEP_SCHEMAS.assign,
    FINDING_STEP_SCHEMAS.reopen,
  ],
  { error: "kind must be one of acknowledge, start_mitigation, resolve, accept_risk, comment, assign, reopen." },
);
/** The same steps from the finding page's forms, which also carry the finding's id. */
export const findingStepFormSchema = findingEventSchema.and(z.object({ findingId: requiredId("finding") }));
export type FindingEventInput = z.output<typeof findingEventSchema>;
export const FINDING_EVENT_INPUT_KINDS = ["acknowledge", "start_mitigation", "resolve", "accept_risk", "comment", "assign", "reopen"] as const;


const filterId = (label: string) =>
  z
    .string()
    .optional()
    .transform((v) => (v === undefined || v === "" ? undefined : Number(v)))
    .refine((v) => v === undefined || (Number.isInteger(v) && v > 0), `${label} must be a positive whole number.`);

/** A comma-separated list of allowed values ("critical,high"). */
const oneOrMore = <const T extends readonly [string, ...string[]]>(label: string, values: T) =>
  z
    .string()
    .optional()
    // "all" is an explicit "no filter", so a saved default view can be overridden from the URL.
    .transform((v) => (v && v !== "all" ? v.split(",").map((s) => s.trim()).filter(Boolean) : undefined))
    .refine((list) => !list || list.every((s) => (values as readonly string[]).includes(s)), `${label} must be one or more of: ${values.join(", ")}.`)
    .transform((list) => list as T[number][] | undefined);

export const FINDING_SORTS = ["severity", "status", "rule", "location", "ratio", "worstCaseTempC", "age", "updated"] as const;

export const findingListQuerySchema = listQuerySchema({
  sortable: FINDING_SORTS,
  defaultSort: "severity",
  defaultDir: "desc",
  filters: {
    severity: oneOrMore("severity", SEVERITIES),
    status: oneOrMore("status", FINDING_STATUSES),
    scenario: oneOrMore("scenario", SCENARIOS),
    siteId: filterId("siteId"),
    roomId: filterId("roomId"),
    storageUnitId: filterId("storageUnitId"),
    rule: z.string().trim().max(60, "rule is at most 60 characters.").optional(),
    q: z.string().trim().max(100, "q is at most 100 characters.").optional(),
  },
});
export type FindingListQuery = z.output<typeof findingListQuerySchema>;

/** A saved register view: the query string of the register page, for one role. */
export const registerViewSchema = z.object({
  role: z.enum(["admin", "safety_officer", "researcher", "facilities", "auditor"], { error: "Choose a role." }),
  query: z
    .string()
    .max(500, "The view is too long.")
    .transform((v) => v.replace(/^\?/, ""))
    .refine((v) => findingListQuerySchema.safeParse(Object.fromEntries(new URLSearchParams(v))).success, "That view has filters the register does not know."),
});

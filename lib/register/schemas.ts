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

export const REGISTER_VIEW_KINDS = ["lines", "flat", "locations"] as const;
export type RegisterViewKind = (typeof REGISTER_VIEW_KINDS)[number];

export const FINDING_SORTS = ["severity", "status", "rule", "location", "ratio", "worstCaseTempC", "timeToDanger", "age", "updated"] as const;

/** The longest search of the register (`q`). */
export const FINDING_SEARCH_MAX_LENGTH = 100;

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
    containerId: filterId("containerId"),
    substanceId: filterId("substanceId"),
    mine: z
      .enum(["true", "false", ""], { error: "mine must be true or false." })
      .optional()
      .transform((v) => v === "true"),
    rule: z.string().trim().max(60, "rule is at most 60 characters.").optional(),
    q: z.string().trim().max(FINDING_SEARCH_MAX_LENGTH, `q is at most ${FINDING_SEARCH_MAX_LENGTH} characters.`).optional(),
    /** The register page's view: one line per problem, every finding, or by location (the API ignores it). */
    view: z.enum(REGISTER_VIEW_KINDS, { error: `view must be one of: ${REGISTER_VIEW_KINDS.join(", ")}.` }).optional(),
  },
});
export type FindingListQuery = z.output<typeof findingListQuerySchema>;

/** Most findings one bulk step may name. */
export const MAX_BULK_FINDINGS = 500;

const bulkIds = {
  findingIds: z
    .array(requiredId("finding (a positive whole number)"), {
      error: "findingIds must be a list of finding ids.",
    })
    .min(1, "Choose at least one finding.")
    .max(MAX_BULK_FINDINGS, `At most ${MAX_BULK_FINDINGS} findings at once.`)
    .refine((ids) => new Set(ids).size === ids.length, "Name each finding once."),
};

/**
 * One step on many findings: `{ findingIds, kind, … }` with the same fields as one finding's step
 * (reopen and resolve stay per finding: each needs its own reason).
 */
export const bulkFindingEventSchema = z.discriminatedUnion(
  "kind",
  [
    FINDING_STEP_SCHEMAS.acknowledge.extend(bulkIds),
    FINDING_STEP_SCHEMAS.start_mitigation.extend(bulkIds),
    FINDING_STEP_SCHEMAS.accept_risk.extend(bulkIds),
    FINDING_STEP_SCHEMAS.comment.extend(bulkIds),
    FINDING_STEP_SCHEMAS.assign.extend(bulkIds),
  ],
  { error: "kind must be one of acknowledge, start_mitigation, accept_risk, comment, assign." },
);
export type BulkFindingEventInput = z.output<typeof bulkFindingEventSchema>;
export const BULK_EVENT_KINDS = ["acknowledge", "assign", "comment", "start_mitigation", "accept_risk"] as const;

/** A saved register view: the query string of the register page, for one role. */
export const registerViewSchema = z.object({
  role: z.enum(["admin", "safety_officer", "researcher", "facilities", "auditor"], { error: "Choose a role." }),
  query: z
    .string()
    .max(500, "The view is too long.")
    .transform((v) => v.replace(/^\?/, ""))
    .refine((v) => findingListQuerySchema.safeParse(Object.fromEntries(new URLSearchParams(v))).success, "That view has filters the register does not know."),
});

import { z } from "zod";
import { assessmentPreviewSchema } from "@/lib/assessment/preview";
import { assessmentSettingsSchema } from "@/lib/assessment/rules";
import { storagePlanSchema } from "@/lib/assessment/storage-plan";
import { auditListQuerySchema } from "@/lib/audit/schemas";
import { registerExportQuerySchema } from "@/lib/exports/schemas";
import { bulkFindingEventSchema, findingEventSchema, findingListQuerySchema } from "@/lib/register/schemas";
import type { ApiOperation } from "../operation";
import { assessmentPreviewResultSchema, auditEventSchema, bulkResultSchema, dataOf, findingListRowSchema, findingSchema, listPageOf, storagePlanSchemaOut } from "../schemas";

const XLSX = "application/vnd.openxmlformats-officedocument.spreadsheetml.sheet";


export const findingListExample = {
  data: [
    {
      id: 118,
      fingerprint: "vapor_lfl|unit:7|substance:2|control_lost",
      rule: "vapor_lfl",
      severity: "high",
      status: "open",
      scenario: "control_lost",
      title: "Acetone vapor could reach 31 % of its LFL in FSR-1 if cooling fails",
      value: 0.31,
      limit: 0.25,
      ratio: 1.24,
      unit: "fraction of LFL",
      worstCaseTempC: 21.6,
      worstCaseSource: "Room 2.115 ambient sensor S-204, highest reading in the last 12 months",
      timeToDanger: { minutes: 155, threshold: "high", tempC: 14.2 },
      firstRaisedAt: "2026-11-02T07:31:10.000Z",
      updatedAt: "2026-12-05T07:31:10.000Z",
      location: { siteId: 1, siteName: "North Campus", roomId: 3, roomCode: "2.115", storageUnitId: 7, unitCode: "FSR-1", label: "2.115 / FSR-1" },
      substance: { id: 2, name: "Acetone", cas: "67-64-1" },
      mixture: null,
      containerId: null,
      assignee: null,
    },
  ],
  page: 1,
  pageSize: 25,
  total: 1,
};

const tag = "Register";

export const registerOperations: ApiOperation[] = [
  {
    method: "get",
    path: "/api/v1/findings",
    tag,
    summary: "The register",
    description:
      "Every finding on its own. `severity`, `status` and `scenario` take comma-separated lists; `roomId` includes the room's units' findings; `containerId` gives the findings that container contributes to; `mine=true` those touching your own containers; `q` matches the title and room and unit codes. Researchers and facilities see the findings on what they own or look after. Values are screening estimates.",
    access: { action: "findings.read" },
    query: findingListQuerySchema,
    success: { status: 200, description: "A page of findings.", schema: listPageOf(findingListRowSchema, "FindingList"), example: findingListExample },
  },
  {
    method: "get",
    path: "/api/v1/findings/{id}",
    tag,
    summary: "One finding",
    description: "With its calculation trace and its history of events.",
    access: { action: "findings.read" },
    success: { status: 200, description: "The finding.", schema: dataOf(findingSchema) },
    errors: { 404: "No such finding, or it is not on a location you look after." },
  },
  {
    method: "post",
    path: "/api/v1/findings/{id}/events",
    tag,
    summary: "Take a step on a finding",
    description:
      "`kind`: acknowledge, start_mitigation, resolve, accept_risk, comment, assign or reopen, with that step's fields. Each step needs its own permission (accepting a risk: safety officers only). A resolve re-assesses the location first and, while the condition still holds, leaves the finding in its status and answers with a `message` saying so.",
    access: { action: "findings.comment" },
    body: findingEventSchema,
    bodyExamples: {
      acknowledge: { summary: "Acknowledge", value: { kind: "acknowledge", note: "Seen; checking the refrigerator's door seal." } },
      mitigate: { summary: "Start mitigation", value: { kind: "start_mitigation", plan: "Move the acetone stock to FC-1 in B-014 and keep 500 mL in FSR-1.", assigneeId: 2 } },
    },
    success: { status: 201, description: "The step was recorded; the finding as it now stands.", schema: dataOf(findingSchema) },
    errors: { 409: "The finding's status does not allow that step." },
  },
  {
    method: "post",
    path: "/api/v1/findings/events",
    tag,
    summary: "One step on many findings",
    description:
      "`findingIds` (1–500) with one step (acknowledge, assign, comment, start_mitigation, accept_risk) and its fields, in one transaction. Each finding is checked on its own (a researcher only acts on findings on their containers); a refused finding keeps nothing.",
    access: { action: "findings.comment" },
    body: bulkFindingEventSchema,
    bodyExamples: { assign: { summary: "Assign three findings", value: { kind: "assign", findingIds: [118, 119, 124], assigneeId: 4 } } },
    success: { status: 200, description: "One answer per finding, in the order given.", schema: bulkResultSchema },
  },
  {
    method: "post",
    path: "/api/v1/assessments/preview",
    tag: "Assessment",
    summary: "What if: assess a change without storing it",
    description:
      "`{ storageUnitId, substanceId | mixtureId, amount, amountUnit, state? }` for a new container; with `containerId` too, an edit of that stored container; `{ storageUnitId, containerId }` alone, a move. A stored container needs the right to change it (researchers: their own). Writes nothing. Results are screening estimates.",
    access: { action: "assessments.preview" },
    body: assessmentPreviewSchema,
    bodyExamples: { newBottle: { summary: "A new 2.5 L bottle of acetone in FSR-1", value: { storageUnitId: 7, substanceId: 2, amount: 2.5, amountUnit: "L" } } },
    success: { status: 200, description: "What the change would raise, and safer places.", schema: dataOf(assessmentPreviewResultSchema) },
    errors: {
      400: "The substance, mixture or container does not exist, or the container is already in that unit (named in `fields`).",
      404: "No such storage unit.",
      409: "The container was disposed of; its record is kept and cannot be changed.",
      403: "A stored container you may not change (researchers: only their own).",
    },
    rateLimited: "Too many what-if questions by you in a short time.",
  },
  {
    method: "get",
    path: "/api/v1/storage-plan",
    tag: "Assessment",
    summary: "Where could this be stored instead?",
    description:
      "The live units that can hold the content, ranked: verdict from the unit's point of view (`no_findings`, `already_flagged`, `raises`), then the lowest worst severity, the longest time to danger, nearness. `containerId` plans moving that stored container (researchers: their own only). When no unit can hold the amount, `data` is empty and `message` says so. Results are screening estimates.",
    access: { action: "containers.write" },
    query: storagePlanSchema,
    success: {
      status: 200,
      description: "The places, best first.",
      schema: storagePlanSchemaOut,
      example: {
        data: [
          {
            storageUnitId: 1,
            code: "FC-1",
            name: "Flammable-liquid cabinet, 45 gal",
            unitKind: "flammable_cabinet",
            roomId: 1,
            roomCode: "B-014",
            roomName: "Solvent store",
            siteId: 1,
            siteName: "North Campus",
            verdict: "no_findings",
            worstSeverity: null,
            maxRatio: null,
            timeToDanger: null,
            raised: 0,
            nearness: "same_site",
            reason: "Nothing about it would be flagged here.",
          },
        ],
      },
    },
    errors: { 404: "The substance, mixture, site, room or container does not exist." },
    rateLimited: "Too many what-if questions by you in a short time.",
  },
  {
    method: "get",
    path: "/api/v1/settings/assessment",
    tag: "Assessment",
    summary: "The assessment's thresholds and assumptions",
    access: { action: "findings.read" },
    success: { status: 200, description: "The settings in force.", schema: dataOf(assessmentSettingsSchema) },
  },
  {
    method: "put",
    path: "/api/v1/settings/assessment",
    tag: "Assessment",
    summary: "Replace the assessment's thresholds and assumptions",
    description: "Every location is re-assessed in a background job whose id is returned.",
    access: { action: "hazardSettings.write" },
    body: assessmentSettingsSchema,
    success: { status: 202, description: "Stored; the re-assessment runs in the background.", schema: dataOf(z.object({ jobId: z.number().int().meta({ description: "The background re-assessment of every location." }), settings: assessmentSettingsSchema })) },
  },
  {
    method: "get",
    path: "/api/v1/exports/register.xlsx",
    tag: "Exports",
    summary: "The register as an Excel workbook",
    description: "For audits: the findings with their traces, the locations' worst cases, and the methods, assumptions and cautions. Streamed; `siteId` for one site.",
    access: { action: "exports.download" },
    query: registerExportQuerySchema,
    success: { status: 200, description: "The workbook, as an attachment.", binary: [XLSX], headers: { "Content-Disposition": "attachment, with the file's name." } },
    errors: { 400: "No site has that id (`fields.siteId`)." },
    workerThread: "The server is busy with other imports and exports (`server_busy`); try again in a minute.",
    rateLimited: "Too many exports by you in a short time.",
  },
  {
    method: "get",
    path: "/api/v1/audit-events",
    tag: "Audit",
    summary: "The audit log",
    description: "Who changed what, when, with before and after values.",
    access: { action: "audit.read" },
    query: auditListQuerySchema,
    success: { status: 200, description: "A page of events, newest first by default.", schema: listPageOf(auditEventSchema, "AuditEventList") },
  },
];

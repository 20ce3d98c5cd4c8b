/**
 * The OpenAPI 3.1 document of /api/v1, built from the routes' own zod schemas (zod-openapi) once
 * per process and served by `GET /api/v1/openapi.json`. To add an API route, add its operation to
 * the list of its resource in `operations/`: tests/integration/openapi.test.ts fails until the
 * document and the route files match.
 */
import { z } from "zod";
import { createDocument, type ZodOpenApiPathsObject } from "zod-openapi";
import { SESSION_COOKIE } from "@/lib/auth/session";
import { API_KEY_SCHEME, SESSION_COOKIE_SCHEME, toOpenApiOperation, type ApiOperation } from "./operation";
import { accountOperations } from "./operations/accounts";
import { inventoryOperations } from "./operations/inventory";
import { locationOperations } from "./operations/locations";
import { registerOperations } from "./operations/register";
import { temperatureOperations } from "./operations/temperatures";
import { WEBHOOKS_DESCRIPTION, WEBHOOKS_TAG, webhookDocuments } from "./webhooks";

export const API_DOCUMENT_VERSION = "1.0.0";

const documentOperations: ApiOperation[] = [
  {
    method: "get",
    path: "/api/v1/openapi.json",
    tag: "Reference",
    summary: "This document",
    description: "The OpenAPI 3.1 description of the API, as JSON. Readable without signing in; the reference page at /api-docs renders it.",
    access: "public",
    success: { status: 200, description: "The document.", schema: z.object({ openapi: z.string() }).loose(), headers: { "Cache-Control": "public, max-age=300" } },
  },
];

/** Every documented operation, in the order the reference lists them. */
export const API_OPERATIONS: readonly ApiOperation[] = [
  ...accountOperations,
  ...locationOperations,
  ...inventoryOperations,
  ...temperatureOperations,
  ...registerOperations,
  ...documentOperations,
];

const TAGS = [
  { name: "Sessions", description: "Signing in and out, who you are, your alert choices and your sessions." },
  { name: "Users", description: "Accounts: invitations and ending a person's sessions (administrators)." },
  { name: "API keys", description: "Keys for machines such as logger gateways (administrators). A key is shown once, when created." },
  { name: "Locations", description: "Sites, rooms and storage units, with the values the assessment uses (volume, ventilation, set ranges)." },
  { name: "Containers", description: "The inventory: containers, what they hold, where, and their state." },
  { name: "Mixtures", description: "Mixtures by their components' mass or mole fractions." },
  { name: "Substances", description: "The substance library: properties with their sources, vapor pressure, safety data sheets." },
  { name: "Files", description: "Stored safety data sheets." },
  { name: "Imports", description: "Containers and locations from CSV or XLSX files: check first, then import all or nothing." },
  { name: "Logger ingest", description: "Temperature readings from loggers and gateways, with an API key." },
  { name: "Temperatures", description: "Sensors, their readings, logger file uploads and excursions." },
  { name: "Register", description: "Findings: the register of what the assessment flagged, and the steps people take on them." },
  { name: "Assessment", description: "What-if questions, the storage planner and the assessment's settings." },
  { name: "Exports", description: "The register as an Excel workbook for audits." },
  { name: "Audit", description: "The audit log." },
  { name: "Reference", description: "This document." },
  { name: WEBHOOKS_TAG, description: "The events Headroom sends to the endpoints administrators register (Admin → Webhooks): payloads, signature headers and the answer expected." },
];

const DESCRIPTION = `The JSON API behind Headroom: the inventory of volatile liquids per room and storage unit, the temperatures that drive the worst cases, and the register of findings.

**Results are screening estimates.** Worst-case vapor concentrations come from simple, conservative models and the substance library's values; they flag what deserves a closer look by a competent person and do not replace a measurement or a professional assessment.

**Authentication.** People use the session cookie that \`POST /api/v1/session\` sets (in a browser on this site the reference page's "Try it out" sends it). Writes with the cookie must come from this site's own pages (same origin). Machines — logger gateways — send an API key as \`Authorization: Bearer hrk_…\` and may only call the routes that say so (today \`POST /api/v1/readings\`, scope \`readings:write\`). Each operation names the permission and the roles that have it.

**Conventions.** Bodies are JSON (\`Content-Type: application/json\`, at most 1 MB unless stated) except uploads (multipart, field \`file\`). Lists answer \`{ data, page, pageSize, total }\` and read \`page\`, \`pageSize\` (1–100), \`sort\`, \`dir\` and their own filters from the query string. Times are ISO-8601. Every error answers \`{ error: { code, message, fields? } }\`; 429 comes with \`Retry-After\`.

${WEBHOOKS_DESCRIPTION}`;

/** zod's `.int()` bounds a number by ±(2^53 − 1); said in the document, the reference would show them as example values. */
function withoutSafeIntegerBounds(ctx: { jsonSchema: Record<string, unknown> }) {
  if (ctx.jsonSchema.minimum === Number.MIN_SAFE_INTEGER) delete ctx.jsonSchema.minimum;
  if (ctx.jsonSchema.maximum === Number.MAX_SAFE_INTEGER) delete ctx.jsonSchema.maximum;
}

function buildDocument() {
  const paths: ZodOpenApiPathsObject = {};
  for (const op of API_OPERATIONS) {
    paths[op.path] ??= {};
    if (paths[op.path][op.method]) throw new Error(`${op.method.toUpperCase()} ${op.path} is documented twice.`);
    paths[op.path][op.method] = toOpenApiOperation(op);
  }
  return createDocument(
    {
    openapi: "3.1.0",
    info: { title: "Headroom API", version: API_DOCUMENT_VERSION, description: DESCRIPTION },
    servers: [{ url: "/", description: "This Headroom installation" }],
    tags: TAGS,
    paths,
    webhooks: webhookDocuments(),
    components: {
      securitySchemes: {
        [SESSION_COOKIE_SCHEME]: {
          type: "apiKey",
          in: "cookie",
          name: SESSION_COOKIE,
          description: "The session cookie set by `POST /api/v1/session` (or by signing in on the site). What it allows depends on the person's role.",
        },
        [API_KEY_SCHEME]: {
          type: "http",
          scheme: "bearer",
          bearerFormat: "hrk_…",
          description: "An API key created by an administrator (Admin → API keys), sent as `Authorization: Bearer hrk_…`. The key's scopes say which routes it may call.",
        },
      },
    },
  },
    { override: withoutSafeIntegerBounds },
  );
}

let cached: ReturnType<typeof buildDocument> | undefined;

/** The document, built on first use. */
export function apiDocument() {
  cached ??= buildDocument();
  return cached;
}

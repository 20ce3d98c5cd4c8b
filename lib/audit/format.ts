/**
 * The audit log in words: record types, actions, field names and stored values as people read
 * them ("Status: Open → Risk accepted"), only the fields that changed, nested values as text.
 * Pure, so the audit table (a client component) and tests use it alike.
 */
import { ROLE_LABELS } from "@/lib/auth/permissions";
import { CONTAINER_KIND_LABELS, CONTAINER_STATE_LABELS } from "@/lib/format/container-labels";
import { ROOM_KIND_LABELS, STORAGE_UNIT_KIND_LABELS } from "@/lib/format/labels";
import { SCENARIO_LABELS, STATUS_LABELS } from "@/lib/register/labels";
import { RULE_LABELS } from "@/lib/register/rule-labels";

/** Every kind of record the audit log holds, with its filter label (the API's `entityType`). */
export const AUDIT_ENTITY_LABELS = {
  finding: "Finding",
  container: "Container",
  mixture: "Mixture",
  substance: "Substance",
  site: "Site",
  room: "Room",
  storage_unit: "Storage unit",
  location: "Locations import",
  sensor: "Sensor",
  excursion: "Excursion",
  user: "Person",
  session: "Session",
  api_key: "API key",
  setting: "Setting",
  export: "Export",
  installation: "Installation",
} as const;

export type AuditEntityType = keyof typeof AUDIT_ENTITY_LABELS;
export const AUDIT_ENTITY_TYPES = Object.keys(AUDIT_ENTITY_LABELS) as [AuditEntityType, ...AuditEntityType[]];

export const AUDIT_ACTION_LABELS: Record<string, string> = {
  create: "Created",
  update: "Changed",
  move: "Moved",
  retire: "Retired",
  restore: "Restored",
  import: "Imported",
  seed: "Demo data loaded",
  invite: "Invited",
  change_role: "Role changed",
  deactivate: "Deactivated",
  sign_in: "Signed in",
  sign_out: "Signed out",
  end_session: "Session ended",
  end_sessions: "Sessions ended",
  request_password_reset: "Password reset requested",
  revoke: "Revoked",
  public: "Made public",
  attach_sds: "Safety data sheet attached",
  download: "Downloaded",
  upload_readings: "Readings uploaded",
  acknowledge: "Acknowledged (excursion)",
  acknowledged: "Acknowledged (finding)",
  mitigation_started: "Mitigation started",
  resolved: "Resolved",
  risk_accepted: "Risk accepted",
  comment: "Commented",
  assigned: "Assigned",
  reopened: "Re-opened",
  // Single sign-on
  sign_in_refused: "Sign-in refused",
  link_sso: "Linked to single sign-on",
};

/** Fields never listed as changes: bookkeeping, secrets and the record's own id. */
const HIDDEN_FIELDS = new Set(["id", "createdAt", "updatedAt", "passwordHash", "tokenHash", "keyHash", "secret", "assessmentInputKey", "assessedAt", "sessionVersion"]);

const FIELD_LABELS: Record<string, string> = {
  status: "Status",
  severity: "Severity",
  scenario: "Scenario",
  rule: "Rule",
  assigneeId: "Assignee",
  mitigationPlan: "Mitigation plan",
  riskAcceptedUntil: "Risk accepted until",
  storageUnitId: "Storage unit",
  roomId: "Room",
  siteId: "Site",
  substanceId: "Substance",
  mixtureId: "Mixture",
  ownerId: "Owner",
  facilitiesContactId: "Facilities contact",
  externalId: "Device id",
  cas: "CAS number",
  label: "Label",
  name: "Name",
  code: "Code",
  kind: "Kind",
  state: "State",
  role: "Role",
  email: "E-mail",
  active: "Active",
  amount: "Amount",
  amountUnit: "Amount unit",
  capacity: "Capacity",
  capacityUnit: "Capacity unit",
  designMaxTempC: "Design maximum (°C)",
  setMinC: "Set range min (°C)",
  setMaxC: "Set range max (°C)",
  excursionThresholdC: "Excursion threshold (°C)",
  excursionMinDurationMin: "Excursion minimum duration (min)",
  floorAreaM2: "Floor area (m²)",
  heightM: "Height (m)",
  airChangesPerHour: "Air changes per hour",
  internalVolumeL: "Internal volume (L)",
  molarMassGPerMol: "Molar mass (g/mol)",
  normalBoilingPointC: "Normal boiling point (°C)",
  flashPointC: "Flash point (°C)",
  lflVolPercent: "LFL (% vol)",
  uflVolPercent: "UFL (% vol)",
  autoignitionTempC: "Autoignition temperature (°C)",
  liquidDensityKgPerM3: "Liquid density (kg/m³)",
  enthalpyOfVaporizationKJPerMol: "Enthalpy of vaporization (kJ/mol)",
  peakTempC: "Peak (°C)",
  peakAt: "Peak at",
  thresholdC: "Threshold (°C)",
  startAt: "Start",
  endAt: "End",
  acknowledgedAt: "Acknowledged at",
  acknowledgedById: "Acknowledged by",
  acknowledgeComment: "Acknowledgement note",
  sensorId: "Sensor",
  receivedAt: "Received",
  openedAt: "Opened",
  expiresAt: "Expires",
  alertExcursions: "Excursion alerts",
  alertFindings: "Finding alerts",
  dailyDigest: "Daily digest",
  ignitionSourceFree: "Free of ignition sources",
  exposureLimits: "Exposure limits",
  correlations: "Vapor-pressure equations",
  components: "Components",
  fractionBasis: "Fraction basis",
  physicalState: "Physical state",
  // Single sign-on
  method: "Method",
  signInMethod: "Sign-in method",
  reason: "Reason",
  groups: "Groups received",
  mappings: "Group rules",
  group: "Group",
  jitDomains: "Accounts made at first sign-in for",
  requireSso: "Single sign-on required",
  breakGlassUserId: "Break-glass administrator",
};

/** Codes with their own words, by field. */
const VALUE_LABELS: Record<string, Record<string, string>> = {
  status: STATUS_LABELS,
  scenario: SCENARIO_LABELS,
  rule: RULE_LABELS,
  role: ROLE_LABELS,
  severity: { critical: "Critical", high: "High", moderate: "Moderate", low: "Low" },
  state: CONTAINER_STATE_LABELS,
  alertExcursions: { immediate: "As they happen", digest: "In the daily digest", off: "Off" },
  alertFindings: { immediate: "As they happen", digest: "In the daily digest", off: "Off" },
  method: { password: "Password", sso: "Single sign-on" },
  signInMethod: { password: "Password", sso: "Single sign-on" },
  reason: {
    no_group: "No group rule matches",
    not_invited: "Not invited",
    deactivated: "Account deactivated",
    no_email: "No e-mail address sent",
    email_unverified: "E-mail address not verified",
    other_identity: "Linked to another identity",
    break_glass: "Break-glass account (password only)",
  },
};

/** Fields that hold the id of another record, and which: the log names the record, not its number. */
export const AUDIT_REFERENCE_FIELDS = {
  assigneeId: "user",
  ownerId: "user",
  facilitiesContactId: "user",
  acknowledgedById: "user",
  invitedById: "user",
  breakGlassUserId: "user",
  roomId: "room",
  storageUnitId: "storage_unit",
  siteId: "site",
  substanceId: "substance",
  mixtureId: "mixture",
  sensorId: "sensor",
} as const;
export type AuditReferenceKind = (typeof AUDIT_REFERENCE_FIELDS)[keyof typeof AUDIT_REFERENCE_FIELDS];
/** Names of referenced records by kind and id (from the database; a missing one shows as "#id"). */
export type AuditReferenceNames = Partial<Record<AuditReferenceKind, Record<number, string>>>;

function referenceName(key: string, value: unknown, names: AuditReferenceNames | undefined): string | null {
  const kind = (AUDIT_REFERENCE_FIELDS as Record<string, AuditReferenceKind>)[key];
  if (!kind || typeof value !== "number") return null;
  return names?.[kind]?.[value] ?? `#${value}`;
}

const KIND_LABELS_BY_ENTITY: Record<string, Record<string, string>> = {
  room: ROOM_KIND_LABELS,
  storage_unit: STORAGE_UNIT_KIND_LABELS,
  container: CONTAINER_KIND_LABELS,
};

/** "riskAcceptedUntil" → "Risk accepted until"; "storageUnitId" → "Storage unit"; "tempC" → "Temp (°C)". */
export function humaniseField(key: string): string {
  let unit = "";
  let base = key;
  for (const [suffix, text] of [["TempC", " (°C)"], ["C", " (°C)"], ["M3", " (m³)"], ["L", " (L)"], ["Min", " (min)"], ["Id", ""], ["At", " at"]] as const) {
    if (base.length > suffix.length && base.endsWith(suffix) && /[a-z]/.test(base.charAt(base.length - suffix.length - 1))) {
      base = base.slice(0, -suffix.length) + (suffix === "TempC" ? "Temperature" : "");
      unit = text;
      break;
    }
  }
  const words = base
    .replace(/_/g, " ")
    .replace(/([a-z0-9])([A-Z])/g, "$1 $2")
    .toLowerCase()
    .trim();
  return (words.charAt(0).toUpperCase() + words.slice(1) + unit).trim();
}

export function fieldLabel(key: string): string {
  return FIELD_LABELS[key] ?? humaniseField(key);
}

/** "risk_accepted" → "Risk accepted", for a code without its own label. */
function humaniseCode(code: string): string {
  const text = code.replace(/_/g, " ");
  return text.charAt(0).toUpperCase() + text.slice(1);
}

const ISO_INSTANT = /^\d{4}-\d{2}-\d{2}T\d{2}:\d{2}(:\d{2}(\.\d+)?)?Z$/;
const CODE = /^[a-z]+(_[a-z]+)+$/;

function formatNumberValue(value: number): string {
  if (Number.isInteger(value)) return String(value);
  return String(Number(value.toPrecision(4)));
}

/** A stored value in words: dates as yyyy-mm-dd hh:mm UTC, yes/no, codes by their label, lists and objects as readable text. */
export function formatAuditValue(value: unknown, key = "", entityType = ""): string {
  if (value === null || value === undefined || value === "") return "—";
  if (typeof value === "boolean") return value ? "Yes" : "No";
  if (typeof value === "number") return Number.isFinite(value) ? formatNumberValue(value) : "—";
  if (typeof value === "string") {
    if (ISO_INSTANT.test(value)) {
      const text = value.slice(0, 16).replace("T", " ");
      return text.endsWith(" 00:00") && /(Until|expiresAt|receivedAt|openedAt)$/.test(key) ? text.slice(0, 10) : `${text} UTC`;
    }
    const labels = key === "kind" ? KIND_LABELS_BY_ENTITY[entityType] : VALUE_LABELS[key];
    if (labels && labels[value]) return labels[value];
    if (CODE.test(value)) return humaniseCode(value);
    return value;
  }
  if (Array.isArray(value)) {
    if (value.length === 0) return "none";
    return value.map((item) => formatAuditValue(item, key, entityType)).join("; ");
  }
  if (typeof value === "object") {
    const entries = Object.entries(value as Record<string, unknown>).filter(([k, v]) => !HIDDEN_FIELDS.has(k) && v !== null && v !== undefined && v !== "");
    if (entries.length === 0) return "—";
    return entries.map(([k, v]) => `${fieldLabel(k)} ${formatAuditValue(v, k, entityType)}`).join(", ");
  }
  return String(value);
}

export type AuditChange = { field: string; label: string; before: string; after: string };

const same = (a: unknown, b: unknown) => JSON.stringify(a ?? null) === JSON.stringify(b ?? null);

/**
 * The fields an event changed, in words: only those whose value differs (never "Id: 2 → 2"),
 * without bookkeeping fields. A snapshot that is not an object (a setting's value) counts as one
 * field named "Value".
 */
export function auditChanges(event: { entityType: string; before: unknown; after: unknown }, names?: AuditReferenceNames): AuditChange[] {
  const isRecord = (v: unknown): v is Record<string, unknown> => typeof v === "object" && v !== null && !Array.isArray(v);
  if (!isRecord(event.before) || !isRecord(event.after)) {
    if (event.before == null || same(event.before, event.after)) return [];
    return [{ field: "value", label: "Value", before: formatAuditValue(event.before, "", event.entityType), after: formatAuditValue(event.after, "", event.entityType) }];
  }
  const before = event.before;
  const after = event.after;
  const keys = [...new Set([...Object.keys(before), ...Object.keys(after)])];
  return keys
    .filter((key) => !HIDDEN_FIELDS.has(key) && !same(before[key], after[key]))
    .map((key) => ({
      field: key,
      label: fieldLabel(key),
      before: referenceName(key, before[key], names) ?? formatAuditValue(before[key], key, event.entityType),
      after: referenceName(key, after[key], names) ?? formatAuditValue(after[key], key, event.entityType),
    }));
}

export function auditEntityLabel(entityType: string): string {
  return (AUDIT_ENTITY_LABELS as Record<string, string>)[entityType] ?? humaniseCode(entityType);
}

export function auditActionLabel(action: string): string {
  return AUDIT_ACTION_LABELS[action] ?? humaniseCode(action);
}

/**
 * Headroom's data model. Timestamps are integers in unix epoch milliseconds (`timestamp_ms`).
 * Every foreign key has an index and an explicit onDelete. Findings are never deleted, so the
 * locations they point at are retired rather than deleted (onDelete "restrict" guards that).
 */
import { sql } from "drizzle-orm";
import {
  check,
  index,
  integer,
  primaryKey,
  real,
  sqliteTable,
  text,
  uniqueIndex,
  type AnySQLiteColumn,
} from "drizzle-orm/sqlite-core";

const nowMs = sql`(cast(unixepoch('subsec') * 1000 as integer))`;

const createdAt = () => integer("created_at", { mode: "timestamp_ms" }).notNull().default(nowMs);
const updatedAt = () => integer("updated_at", { mode: "timestamp_ms" }).notNull().default(nowMs);

import { ROLES, type Role } from "../lib/auth/roles";
import {
  ALERT_DELIVERIES,
  AMOUNT_UNITS,
  CONTAINER_KINDS,
  CONTAINER_STATES,
  EMAIL_STATUSES,
  EXPOSURE_LIMIT_KINDS,
  EXPOSURE_LIMIT_UNITS,
  FINDING_EVENT_KINDS,
  FINDING_STATUSES,
  FRACTION_BASES,
  JOB_STATUSES,
  PHYSICAL_STATES,
  QUANTITY_LIMIT_SCOPES,
  ROOM_KINDS,
  SCENARIOS,
  SEVERITIES,
  STORAGE_UNIT_KINDS,
  USER_TOKEN_KINDS,
  type LiquidClass,
} from "./enums";

export { ROLES, type Role };
export {
  ALERT_DELIVERIES, type AlertDelivery, USER_TOKEN_KINDS, type UserTokenKind, ROOM_KINDS, type RoomKind, STORAGE_UNIT_KINDS, type StorageUnitKind, PHYSICAL_STATES, EXPOSURE_LIMIT_KINDS, EXPOSURE_LIMIT_UNITS, FRACTION_BASES, AMOUNT_UNITS, type AmountUnit, CONTAINER_KINDS, CONTAINER_STATES, type ContainerState, SEVERITIES, type Severity, FINDING_STATUSES, type FindingStatus, SCENARIOS, type Scenario, FINDING_EVENT_KINDS, EMAIL_STATUSES, LIQUID_CLASSES, type LiquidClass, QUANTITY_LIMIT_SCOPES, JOB_STATUSES,
} from "./enums";


// ---------------------------------------------------------------------------------------------
// People, sign-in and access
// ---------------------------------------------------------------------------------------------

export const users = sqliteTable(
  "users",
  {
    id: integer("id").primaryKey({ autoIncrement: true }),
    email: text("email").notNull(),
    name: text("name").notNull(),
    role: text("role", { enum: ROLES }).notNull(),
    /** Null until an invited user sets a password. */
    passwordHash: text("password_hash"),
    active: integer("active", { mode: "boolean" }).notNull().default(true),
    /** Bumped on password change or deactivation; sessions carrying an older value are void. */
    sessionVersion: integer("session_version").notNull().default(1),
    alertFindings: text("alert_findings", { enum: ALERT_DELIVERIES }).notNull().default("immediate"),
    alertExcursions: text("alert_excursions", { enum: ALERT_DELIVERIES }).notNull().default("immediate"),
    dailyDigest: integer("daily_digest", { mode: "boolean" }).notNull().default(true),
    lastSignInAt: integer("last_sign_in_at", { mode: "timestamp_ms" }),
    invitedById: integer("invited_by_id").references((): AnySQLiteColumn => users.id, { onDelete: "set null" }),
    // --- Single sign-on (lib/sso) ---------------------------------------------------------------
    /** How the person signs in: "password", or "sso" through the institution's provider (no local password). */
    signInMethod: text("sign_in_method", { enum: ["password", "sso"] }).notNull().default("password"),
    /** The provider's `iss` and `sub`, set at the first single sign-on; together unique. */
    ssoIssuer: text("sso_issuer"),
    ssoSubject: text("sso_subject"),
    // --- end single sign-on ----------------------------------------------------------------------
    createdAt: createdAt(),
    updatedAt: updatedAt(),
  },
  (t) => [
    uniqueIndex("users_email_unique").on(t.email),
    index("users_invited_by_idx").on(t.invitedById),
    uniqueIndex("users_sso_identity_unique").on(t.ssoIssuer, t.ssoSubject),
  ],
);
export type User = typeof users.$inferSelect;
export type NewUser = typeof users.$inferInsert;


/** Single-use links (invitations, password resets). Only a SHA-256 of the token is stored. */
export const userTokens = sqliteTable(
  "user_tokens",
  {
    id: integer("id").primaryKey({ autoIncrement: true }),
    userId: integer("user_id")
      .notNull()
      .references(() => users.id, { onDelete: "cascade" }),
    kind: text("kind", { enum: USER_TOKEN_KINDS }).notNull(),
    tokenHash: text("token_hash").notNull(),
    expiresAt: integer("expires_at", { mode: "timestamp_ms" }).notNull(),
    usedAt: integer("used_at", { mode: "timestamp_ms" }),
    createdById: integer("created_by_id").references(() => users.id, { onDelete: "set null" }),
    createdAt: createdAt(),
  },
  (t) => [
    uniqueIndex("user_tokens_hash_unique").on(t.tokenHash),
    index("user_tokens_user_idx").on(t.userId),
    index("user_tokens_created_by_idx").on(t.createdById),
  ],
);
export type UserToken = typeof userTokens.$inferSelect;

/**
 * Signed-in sessions, one per sign-in. The cookie carries a random token; only its SHA-256 is
 * stored, so a copy of the database does not sign anyone in. A session ends when its row is
 * deleted (sign-out, "sign out everywhere else", an administrator), when it has been idle or
 * lived too long (SESSION_IDLE_MINUTES, SESSION_MAX_HOURS), or when the user's session_version
 * moves on (password change, deactivation, role change).
 */
export const sessions = sqliteTable(
  "sessions",
  {
    id: integer("id").primaryKey({ autoIncrement: true }),
    tokenHash: text("token_hash").notNull(),
    userId: integer("user_id")
      .notNull()
      .references(() => users.id, { onDelete: "cascade" }),
    /** The user's session_version at sign-in. */
    sessionVersion: integer("session_version").notNull(),
    createdAt: createdAt(),
    /** Written at most about once a minute per session. */
    lastSeenAt: integer("last_seen_at", { mode: "timestamp_ms" }).notNull().default(nowMs),
    userAgent: text("user_agent"),
    ip: text("ip"),
  },
  (t) => [
    uniqueIndex("sessions_token_hash_unique").on(t.tokenHash),
    index("sessions_user_idx").on(t.userId),
    index("sessions_last_seen_idx").on(t.lastSeenAt),
  ],
);
export type Session = typeof sessions.$inferSelect;

/**
 * Counters of the rate limits (rate-limiter-flexible's SQLite store, in its own layout: the key
 * with the limit's prefix, points used, expiry in epoch ms). Created here so that the library
 * never creates tables at run time.
 */
export const rateLimits = sqliteTable(
  "rate_limits",
  {
    key: text("key").primaryKey(),
    points: integer("points").notNull().default(0),
    expire: integer("expire"),
  },
  (t) => [index("rate_limits_expire_idx").on(t.expire)],
);

export const apiKeys = sqliteTable(
  "api_keys",
  {
    id: integer("id").primaryKey({ autoIncrement: true }),
    name: text("name").notNull(),
    /** First characters of the key, shown to tell keys apart; the key itself is never stored. */
    prefix: text("prefix").notNull(),
    keyHash: text("key_hash").notNull(),
    scopes: text("scopes", { mode: "json" }).$type<string[]>().notNull(),
    createdById: integer("created_by_id").references(() => users.id, { onDelete: "set null" }),
    createdAt: createdAt(),
    lastUsedAt: integer("last_used_at", { mode: "timestamp_ms" }),
    revokedAt: integer("revoked_at", { mode: "timestamp_ms" }),
  },
  (t) => [uniqueIndex("api_keys_hash_unique").on(t.keyHash), index("api_keys_created_by_idx").on(t.createdById)],
);
export type ApiKey = typeof apiKeys.$inferSelect;

// ---------------------------------------------------------------------------------------------
// Locations
// ---------------------------------------------------------------------------------------------

export const sites = sqliteTable(
  "sites",
  {
    id: integer("id").primaryKey({ autoIncrement: true }),
    name: text("name").notNull(),
    address: text("address"),
    elevationM: real("elevation_m"),
    /** Local atmospheric pressure used for equilibrium concentrations. */
    atmosphericPressureKPa: real("atmospheric_pressure_kpa").notNull().default(101.325),
    retiredAt: integer("retired_at", { mode: "timestamp_ms" }),
    createdAt: createdAt(),
    updatedAt: updatedAt(),
  },
  (t) => [uniqueIndex("sites_name_unique").on(t.name)],
);
export type Site = typeof sites.$inferSelect;
export type NewSite = typeof sites.$inferInsert;


export const rooms = sqliteTable(
  "rooms",
  {
    id: integer("id").primaryKey({ autoIncrement: true }),
    siteId: integer("site_id")
      .notNull()
      .references(() => sites.id, { onDelete: "restrict" }),
    code: text("code").notNull(),
    name: text("name").notNull(),
    kind: text("kind", { enum: ROOM_KINDS }).notNull().default("laboratory"),
    floorAreaM2: real("floor_area_m2"),
    heightM: real("height_m"),
    airChangesPerHour: real("air_changes_per_hour"),
    /** Well-mixed room model mixing factor k (0 < k ≤ 1). */
    mixingFactor: real("mixing_factor").notNull().default(0.5),
    designMaxTempC: real("design_max_temp_c"),
    sprinklered: integer("sprinklered", { mode: "boolean" }).notNull().default(false),
    /** Walk-in cold rooms have a set range. */
    setMinC: real("set_min_c"),
    setMaxC: real("set_max_c"),
    excursionThresholdC: real("excursion_threshold_c"),
    excursionMinDurationMin: integer("excursion_min_duration_min"),
    facilitiesContactId: integer("facilities_contact_id").references(() => users.id, { onDelete: "set null" }),
    notes: text("notes"),
    retiredAt: integer("retired_at", { mode: "timestamp_ms" }),
    /**
     * When the room and its units were last assessed. A finding whose condition still holds was
     * assessed then too (its own last_evaluated_at moves only when it is written), so a
     * re-assessment that changes nothing writes one row per room, not one per finding.
     */
    assessedAt: integer("assessed_at", { mode: "timestamp_ms" }),
    /** The digest of what the room's own rules read at that assessment (lib/assessment/service.ts); equal inputs are not assessed again. */
    assessmentInputKey: text("assessment_input_key"),
    createdAt: createdAt(),
    updatedAt: updatedAt(),
  },
  (t) => [
    uniqueIndex("rooms_site_code_unique").on(t.siteId, t.code),
    index("rooms_site_idx").on(t.siteId),
    index("rooms_facilities_contact_idx").on(t.facilitiesContactId),
    check("rooms_mixing_factor_range", sql`${t.mixingFactor} > 0 and ${t.mixingFactor} <= 1`),
  ],
);
export type Room = typeof rooms.$inferSelect;
export type NewRoom = typeof rooms.$inferInsert;


export const storageUnits = sqliteTable(
  "storage_units",
  {
    id: integer("id").primaryKey({ autoIncrement: true }),
    roomId: integer("room_id")
      .notNull()
      .references(() => rooms.id, { onDelete: "restrict" }),
    code: text("code").notNull(),
    name: text("name").notNull(),
    kind: text("kind", { enum: STORAGE_UNIT_KINDS }).notNull(),
    internalVolumeL: real("internal_volume_l"),
    setMinC: real("set_min_c"),
    setMaxC: real("set_max_c"),
    excursionThresholdC: real("excursion_threshold_c"),
    excursionMinDurationMin: integer("excursion_min_duration_min"),
    ventilated: integer("ventilated", { mode: "boolean" }).notNull().default(false),
    ignitionSourceFree: integer("ignition_source_free", { mode: "boolean" }).notNull().default(false),
    /**
     * Warm-up time constant τ set by a person (minutes) for Newton's law of heating after a failure;
     * null: the latest fit from the unit's own excursions (warm_up_fits), else the default of its kind.
     */
    warmUpTauMin: real("warm_up_tau_min"),
    /** Why the set τ is what it is (shown beside it). */
    warmUpTauNote: text("warm_up_tau_note"),
    ownerId: integer("owner_id").references(() => users.id, { onDelete: "set null" }),
    notes: text("notes"),
    retiredAt: integer("retired_at", { mode: "timestamp_ms" }),
    /** As rooms.assessmentInputKey, for the unit's own rules (lib/assessment/service.ts). */
    assessmentInputKey: text("assessment_input_key"),
    assessedAt: integer("assessed_at", { mode: "timestamp_ms" }),
    createdAt: createdAt(),
    updatedAt: updatedAt(),
  },
  (t) => [
    uniqueIndex("storage_units_room_code_unique").on(t.roomId, t.code),
    index("storage_units_room_idx").on(t.roomId),
    index("storage_units_owner_idx").on(t.ownerId),
  ],
);
export type StorageUnit = typeof storageUnits.$inferSelect;
export type NewStorageUnit = typeof storageUnits.$inferInsert;

// ---------------------------------------------------------------------------------------------
// Files (safety data sheets)
// ---------------------------------------------------------------------------------------------

export const files = sqliteTable(
  "files",
  {
    id: integer("id").primaryKey({ autoIncrement: true }),
    /** Generated name under the upload directory; never the user's file name. */
    storedName: text("stored_name").notNull(),
    originalName: text("original_name").notNull(),
    contentType: text("content_type").notNull(),
    sizeBytes: integer("size_bytes").notNull(),
    sha256: text("sha256").notNull(),
    uploadedById: integer("uploaded_by_id").references(() => users.id, { onDelete: "set null" }),
    createdAt: createdAt(),
  },
  (t) => [uniqueIndex("files_stored_name_unique").on(t.storedName), index("files_uploaded_by_idx").on(t.uploadedById)],
);
export type StoredFile = typeof files.$inferSelect;

// ---------------------------------------------------------------------------------------------
// Substances and mixtures
// ---------------------------------------------------------------------------------------------


export type SubstanceAlternative = {
  source: string;
  flashPointC?: number;
  lflVolPercent?: number;
  uflVolPercent?: number;
  autoignitionC?: number;
};

/** Stored form of a vapor-pressure correlation (mirrors lib/hazard's VaporPressureCorrelation). */
export type StoredCorrelation = Record<string, unknown> & { kind: string; tMinC: number; tMaxC: number; source?: string };

export const substances = sqliteTable(
  "substances",
  {
    id: integer("id").primaryKey({ autoIncrement: true }),
    cas: text("cas"),
    name: text("name").notNull(),
    synonyms: text("synonyms", { mode: "json" }).$type<string[]>().notNull().default(sql`'[]'`),
    formula: text("formula"),
    physicalState: text("physical_state", { enum: PHYSICAL_STATES }).notNull().default("liquid"),
    molarMassGPerMol: real("molar_mass_g_per_mol").notNull(),
    normalBoilingPointC: real("normal_boiling_point_c"),
    meltingPointC: real("melting_point_c"),
    enthalpyOfVaporizationKJPerMol: real("enthalpy_of_vaporization_kj_per_mol"),
    enthalpyOfSublimationKJPerMol: real("enthalpy_of_sublimation_kj_per_mol"),
    liquidDensityKgPerM3: real("liquid_density_kg_per_m3"),
    flashPointC: real("flash_point_c"),
    lflVolPercent: real("lfl_vol_percent"),
    uflVolPercent: real("ufl_vol_percent"),
    autoignitionTempC: real("autoignition_temp_c"),
    correlations: text("correlations", { mode: "json" }).$type<StoredCorrelation[]>().notNull().default(sql`'[]'`),
    /** Source of every value: field name → citation. */
    sources: text("sources", { mode: "json" }).$type<Record<string, string>>().notNull().default(sql`'{}'`),
    /** Flammability values from other sources, kept beside the primary ones for a safety officer to choose. */
    alternatives: text("alternatives", { mode: "json" }).$type<SubstanceAlternative[]>().notNull().default(sql`'[]'`),
    notes: text("notes"),
    sdsFileId: integer("sds_file_id").references(() => files.id, { onDelete: "set null" }),
    retiredAt: integer("retired_at", { mode: "timestamp_ms" }),
    createdAt: createdAt(),
    updatedAt: updatedAt(),
    updatedById: integer("updated_by_id").references(() => users.id, { onDelete: "set null" }),
  },
  (t) => [
    uniqueIndex("substances_cas_unique").on(t.cas),
    index("substances_name_idx").on(t.name),
    index("substances_sds_file_idx").on(t.sdsFileId),
    index("substances_updated_by_idx").on(t.updatedById),
    check("substances_molar_mass_positive", sql`${t.molarMassGPerMol} > 0`),
  ],
);
export type Substance = typeof substances.$inferSelect;
export type NewSubstance = typeof substances.$inferInsert;


export const exposureLimits = sqliteTable(
  "exposure_limits",
  {
    id: integer("id").primaryKey({ autoIncrement: true }),
    substanceId: integer("substance_id")
      .notNull()
      .references(() => substances.id, { onDelete: "cascade" }),
    kind: text("kind", { enum: EXPOSURE_LIMIT_KINDS }).notNull(),
    value: real("value").notNull(),
    unit: text("unit", { enum: EXPOSURE_LIMIT_UNITS }).notNull(),
    /** Issuing body, e.g. OSHA, NIOSH, or the organisation itself. */
    body: text("body").notNull(),
    source: text("source").notNull(),
    /** Averaging period or basis where it differs from the usual one, e.g. "[10%LEL]". */
    note: text("note"),
  },
  (t) => [index("exposure_limits_substance_idx").on(t.substanceId), check("exposure_limits_value_positive", sql`${t.value} > 0`)],
);
export type ExposureLimit = typeof exposureLimits.$inferSelect;


export const mixtures = sqliteTable(
  "mixtures",
  {
    id: integer("id").primaryKey({ autoIncrement: true }),
    name: text("name").notNull(),
    description: text("description"),
    fractionBasis: text("fraction_basis", { enum: FRACTION_BASES }).notNull(),
    createdById: integer("created_by_id").references(() => users.id, { onDelete: "set null" }),
    retiredAt: integer("retired_at", { mode: "timestamp_ms" }),
    createdAt: createdAt(),
    updatedAt: updatedAt(),
  },
  (t) => [uniqueIndex("mixtures_name_unique").on(t.name), index("mixtures_created_by_idx").on(t.createdById)],
);
export type Mixture = typeof mixtures.$inferSelect;

export const mixtureComponents = sqliteTable(
  "mixture_components",
  {
    id: integer("id").primaryKey({ autoIncrement: true }),
    mixtureId: integer("mixture_id")
      .notNull()
      .references(() => mixtures.id, { onDelete: "cascade" }),
    substanceId: integer("substance_id")
      .notNull()
      .references(() => substances.id, { onDelete: "restrict" }),
    fraction: real("fraction").notNull(),
  },
  (t) => [
    uniqueIndex("mixture_components_unique").on(t.mixtureId, t.substanceId),
    index("mixture_components_substance_idx").on(t.substanceId),
    check("mixture_components_fraction_range", sql`${t.fraction} > 0 and ${t.fraction} <= 1`),
  ],
);
export type MixtureComponent = typeof mixtureComponents.$inferSelect;

// ---------------------------------------------------------------------------------------------
// Containers
// ---------------------------------------------------------------------------------------------


export const containers = sqliteTable(
  "containers",
  {
    id: integer("id").primaryKey({ autoIncrement: true }),
    /** Label or barcode; the key for re-imports. */
    label: text("label").notNull(),
    substanceId: integer("substance_id").references(() => substances.id, { onDelete: "restrict" }),
    mixtureId: integer("mixture_id").references(() => mixtures.id, { onDelete: "restrict" }),
    amount: real("amount").notNull(),
    amountUnit: text("amount_unit", { enum: AMOUNT_UNITS }).notNull(),
    capacity: real("capacity"),
    capacityUnit: text("capacity_unit", { enum: AMOUNT_UNITS }),
    containerKind: text("container_kind", { enum: CONTAINER_KINDS }).notNull().default("glass_bottle"),
    state: text("state", { enum: CONTAINER_STATES }).notNull().default("sealed"),
    storageUnitId: integer("storage_unit_id")
      .notNull()
      .references(() => storageUnits.id, { onDelete: "restrict" }),
    ownerId: integer("owner_id").references(() => users.id, { onDelete: "set null" }),
    receivedAt: integer("received_at", { mode: "timestamp_ms" }),
    openedAt: integer("opened_at", { mode: "timestamp_ms" }),
    expiresAt: integer("expires_at", { mode: "timestamp_ms" }),
    sdsFileId: integer("sds_file_id").references(() => files.id, { onDelete: "set null" }),
    notes: text("notes"),
    createdAt: createdAt(),
    updatedAt: updatedAt(),
  },
  (t) => [
    uniqueIndex("containers_label_unique").on(t.label),
    index("containers_substance_idx").on(t.substanceId),
    index("containers_mixture_idx").on(t.mixtureId),
    index("containers_storage_unit_idx").on(t.storageUnitId, t.state),
    index("containers_owner_idx").on(t.ownerId),
    index("containers_updated_at_idx").on(t.updatedAt),
    // Container list: location order within a unit, one owner's containers newest first, and a
    // state's containers with what they hold (covering, for the sort by substance).
    index("containers_storage_unit_label_idx").on(t.storageUnitId, t.label),
    index("containers_owner_updated_at_idx").on(t.ownerId, t.updatedAt),
    index("containers_state_content_idx").on(t.state, t.substanceId, t.mixtureId),
    index("containers_sds_file_idx").on(t.sdsFileId),
    check(
      "containers_one_content",
      sql`(${t.substanceId} is not null and ${t.mixtureId} is null) or (${t.substanceId} is null and ${t.mixtureId} is not null)`,
    ),
    check("containers_amount_non_negative", sql`${t.amount} >= 0`),
  ],
);
export type Container = typeof containers.$inferSelect;
export type NewContainer = typeof containers.$inferInsert;

export const containerMoves = sqliteTable(
  "container_moves",
  {
    id: integer("id").primaryKey({ autoIncrement: true }),
    containerId: integer("container_id")
      .notNull()
      .references(() => containers.id, { onDelete: "cascade" }),
    fromStorageUnitId: integer("from_storage_unit_id").references(() => storageUnits.id, { onDelete: "restrict" }),
    toStorageUnitId: integer("to_storage_unit_id")
      .notNull()
      .references(() => storageUnits.id, { onDelete: "restrict" }),
    movedById: integer("moved_by_id").references(() => users.id, { onDelete: "set null" }),
    movedAt: integer("moved_at", { mode: "timestamp_ms" }).notNull().default(nowMs),
  },
  (t) => [
    index("container_moves_container_idx").on(t.containerId),
    index("container_moves_from_idx").on(t.fromStorageUnitId),
    index("container_moves_to_idx").on(t.toStorageUnitId),
    index("container_moves_moved_by_idx").on(t.movedById),
  ],
);

// ---------------------------------------------------------------------------------------------
// Temperatures
// ---------------------------------------------------------------------------------------------

export const sensors = sqliteTable(
  "sensors",
  {
    id: integer("id").primaryKey({ autoIncrement: true }),
    /** The logger's own device id, as it appears in uploads and the ingest API. */
    externalId: text("external_id").notNull(),
    name: text("name").notNull(),
    roomId: integer("room_id").references(() => rooms.id, { onDelete: "restrict" }),
    storageUnitId: integer("storage_unit_id").references(() => storageUnits.id, { onDelete: "restrict" }),
    /** Remembered CSV column mapping and time zone for uploads from this logger. */
    csvMapping: text("csv_mapping", { mode: "json" }).$type<Record<string, string>>(),
    timeZone: text("time_zone"),
    active: integer("active", { mode: "boolean" }).notNull().default(true),
    createdAt: createdAt(),
    updatedAt: updatedAt(),
  },
  (t) => [
    uniqueIndex("sensors_external_id_unique").on(t.externalId),
    index("sensors_room_idx").on(t.roomId),
    index("sensors_storage_unit_idx").on(t.storageUnitId),
    check(
      "sensors_one_location",
      sql`(${t.roomId} is not null and ${t.storageUnitId} is null) or (${t.roomId} is null and ${t.storageUnitId} is not null)`,
    ),
  ],
);
export type Sensor = typeof sensors.$inferSelect;

/** One row per sensor and instant: a reading sent twice is stored once. */
export const readings = sqliteTable(
  "readings",
  {
    sensorId: integer("sensor_id")
      .notNull()
      .references(() => sensors.id, { onDelete: "cascade" }),
    at: integer("at", { mode: "timestamp_ms" }).notNull(),
    tempC: real("temp_c").notNull(),
  },
  // The highest reading of a sensor in a window (worst-case temperature) walks the second index from the top.
  (t) => [primaryKey({ columns: [t.sensorId, t.at] }), index("readings_at_idx").on(t.at), index("readings_sensor_temp_idx").on(t.sensorId, t.tempC, t.at)],
);
export type Reading = typeof readings.$inferSelect;

export const excursions = sqliteTable(
  "excursions",
  {
    id: integer("id").primaryKey({ autoIncrement: true }),
    sensorId: integer("sensor_id")
      .notNull()
      .references(() => sensors.id, { onDelete: "cascade" }),
    roomId: integer("room_id").references(() => rooms.id, { onDelete: "restrict" }),
    storageUnitId: integer("storage_unit_id").references(() => storageUnits.id, { onDelete: "restrict" }),
    thresholdC: real("threshold_c").notNull(),
    startAt: integer("start_at", { mode: "timestamp_ms" }).notNull(),
    /** Null while the excursion lasts. */
    endAt: integer("end_at", { mode: "timestamp_ms" }),
    peakTempC: real("peak_temp_c").notNull(),
    peakAt: integer("peak_at", { mode: "timestamp_ms" }).notNull(),
    acknowledgedAt: integer("acknowledged_at", { mode: "timestamp_ms" }),
    acknowledgedById: integer("acknowledged_by_id").references(() => users.id, { onDelete: "set null" }),
    acknowledgeComment: text("acknowledge_comment"),
    createdAt: createdAt(),
    updatedAt: updatedAt(),
  },
  (t) => [
    uniqueIndex("excursions_sensor_start_unique").on(t.sensorId, t.startAt),
    index("excursions_room_idx").on(t.roomId),
    index("excursions_storage_unit_idx").on(t.storageUnitId),
    index("excursions_acknowledged_by_idx").on(t.acknowledgedById),
    index("excursions_open_idx").on(t.endAt),
  ],
);
export type Excursion = typeof excursions.$inferSelect;

/**
 * The history of a unit's warm-up fits: τ of Newton's law of heating, fitted by least squares to the
 * rising part of the unit's recorded excursions against its room's temperature at the time. The
 * latest row is the unit's fitted τ; older rows stay as its history.
 */
export const warmUpFits = sqliteTable(
  "warm_up_fits",
  {
    id: integer("id").primaryKey({ autoIncrement: true }),
    storageUnitId: integer("storage_unit_id")
      .notNull()
      .references(() => storageUnits.id, { onDelete: "cascade" }),
    tauMin: real("tau_min").notNull(),
    rmsErrorC: real("rms_error_c").notNull(),
    /** How many excursions and readings the fit used. */
    excursionCount: integer("excursion_count").notNull(),
    readingCount: integer("reading_count").notNull(),
    /** Mean room temperature the unit warmed towards over the fitted readings. */
    roomTempC: real("room_temp_c").notNull(),
    /** Where the room temperature came from: "sensor" readings or the room's "design" value. */
    roomTempSource: text("room_temp_source", { enum: ["sensor", "design"] }).notNull(),
    excursionIds: text("excursion_ids", { mode: "json" }).$type<number[]>().notNull(),
    fittedAt: integer("fitted_at", { mode: "timestamp_ms" }).notNull(),
    createdAt: createdAt(),
  },
  (t) => [index("warm_up_fits_unit_idx").on(t.storageUnitId, t.fittedAt)],
);
export type WarmUpFit = typeof warmUpFits.$inferSelect;

/** Projected threshold crossings of an open excursion already alerted: once per excursion and threshold. */
export const excursionCrossingAlerts = sqliteTable(
  "excursion_crossing_alerts",
  {
    excursionId: integer("excursion_id")
      .notNull()
      .references(() => excursions.id, { onDelete: "cascade" }),
    /** The threshold's key: substance or group, rule and level (e.g. "substance:12:lfl-fraction:0.25"). */
    thresholdKey: text("threshold_key").notNull(),
    crossingAt: integer("crossing_at", { mode: "timestamp_ms" }).notNull(),
    sentAt: integer("sent_at", { mode: "timestamp_ms" }).notNull(),
  },
  (t) => [primaryKey({ columns: [t.excursionId, t.thresholdKey] })],
);

// ---------------------------------------------------------------------------------------------
// The register
// ---------------------------------------------------------------------------------------------


export const findings = sqliteTable(
  "findings",
  {
    id: integer("id").primaryKey({ autoIncrement: true }),
    /** rule + location + substance + scenario: re-assessment finds the same row again. */
    fingerprint: text("fingerprint").notNull(),
    rule: text("rule").notNull(),
    severity: text("severity", { enum: SEVERITIES }).notNull(),
    status: text("status", { enum: FINDING_STATUSES }).notNull().default("open"),
    scenario: text("scenario", { enum: SCENARIOS }).notNull(),
    title: text("title").notNull(),
    siteId: integer("site_id").references(() => sites.id, { onDelete: "restrict" }),
    roomId: integer("room_id").references(() => rooms.id, { onDelete: "restrict" }),
    storageUnitId: integer("storage_unit_id").references(() => storageUnits.id, { onDelete: "restrict" }),
    containerId: integer("container_id").references(() => containers.id, { onDelete: "set null" }),
    substanceId: integer("substance_id").references(() => substances.id, { onDelete: "restrict" }),
    mixtureId: integer("mixture_id").references(() => mixtures.id, { onDelete: "restrict" }),
    value: real("value"),
    limitValue: real("limit_value"),
    ratio: real("ratio"),
    unit: text("unit"),
    worstCaseTempC: real("worst_case_temp_c"),
    worstCaseSource: text("worst_case_source"),
    /**
     * Control-lost findings: minutes after a failure at which the unit's contents cross the
     * finding's first severity threshold above its in-control state (0: already crossed at the set
     * temperature; null: never reached, or not a control-lost finding), with that threshold's label
     * and temperature.
     */
    timeToDangerMin: real("time_to_danger_min"),
    timeToDangerThreshold: text("time_to_danger_threshold"),
    timeToDangerTempC: real("time_to_danger_temp_c"),
    conditionHolds: integer("condition_holds", { mode: "boolean" }).notNull().default(true),
    assigneeId: integer("assignee_id").references(() => users.id, { onDelete: "set null" }),
    mitigationPlan: text("mitigation_plan"),
    riskAcceptedUntil: integer("risk_accepted_until", { mode: "timestamp_ms" }),
    firstRaisedAt: integer("first_raised_at", { mode: "timestamp_ms" }).notNull().default(nowMs),
    lastEvaluatedAt: integer("last_evaluated_at", { mode: "timestamp_ms" }).notNull().default(nowMs),
    resolvedAt: integer("resolved_at", { mode: "timestamp_ms" }),
    createdAt: createdAt(),
    updatedAt: updatedAt(),
  },
  (t) => [
    uniqueIndex("findings_fingerprint_unique").on(t.fingerprint),
    index("findings_status_severity_idx").on(t.status, t.severity),
    index("findings_site_idx").on(t.siteId),
    // Room first, then unit: a room's own findings (unit null) without reading its units' findings.
    index("findings_room_unit_idx").on(t.roomId, t.storageUnitId),
    // The unit's findings with what the register matches a person's containers against (their
    // substance or mixture, the rule), so that matching reads the index alone (bench/register.ts).
    index("findings_unit_subject_rule_idx").on(t.storageUnitId, t.substanceId, t.mixtureId, t.rule),
    index("findings_container_idx").on(t.containerId),
    index("findings_substance_idx").on(t.substanceId),
    index("findings_mixture_idx").on(t.mixtureId),
    index("findings_assignee_idx").on(t.assigneeId),
  ],
);
export type Finding = typeof findings.$inferSelect;
export type NewFinding = typeof findings.$inferInsert;

/**
 * A finding's calculation trace, apart from the finding's row: it is large (several KB of JSON),
 * written only when a finding is raised or changes, and read only by the finding page, the API and
 * the workbook, so the register's lists and every re-assessment keep to narrow rows.
 */
export const findingTraces = sqliteTable("finding_traces", {
  findingId: integer("finding_id")
    .primaryKey()
    .references(() => findings.id, { onDelete: "cascade" }),
  // The columns the workbook reads come before the JSON: a row's first bytes stay on its b-tree
  // page, the rest of a long row goes to overflow pages that a read of the text then skips.
  /**
   * The trace as readable lines for the workbook, rendered when the trace is written
   * (lib/register/trace-text.ts); long sources are cited as "[S12]", ids of trace_sources.
   * Null for a trace stored before the text was kept: the workbook renders it then.
   */
  text: text("text"),
  /**
   * True when the text was rendered holding only characters XML can hold, with no carriage
   * return (traceText guarantees it), so the workbook copies its UTF-8 bytes into the sheet
   * without decoding and checking them; false for a text stored before.
   */
  textXmlSafe: integer("text_xml_safe", { mode: "boolean" }).notNull().default(false),
  /** The trace_sources ids the text cites, ascending. */
  sourceIds: text("source_ids", { mode: "json" }).$type<number[]>(),
  writtenAt: integer("written_at", { mode: "timestamp_ms" }).notNull().default(nowMs),
  /** The engine's full trace as JSON (see lib/assessment/rules/types.ts FindingTrace). */
  trace: text("trace", { mode: "json" }).$type<unknown>().notNull(),
});
export type FindingTraceRow = typeof findingTraces.$inferSelect;

/** Long source texts cited by the traces' readable text (each one stored once). */
export const traceSources = sqliteTable(
  "trace_sources",
  {
    id: integer("id").primaryKey({ autoIncrement: true }),
    text: text("text").notNull(),
  },
  (t) => [uniqueIndex("trace_sources_text_unique").on(t.text)],
);


export const findingEvents = sqliteTable(
  "finding_events",
  {
    id: integer("id").primaryKey({ autoIncrement: true }),
    findingId: integer("finding_id")
      .notNull()
      .references(() => findings.id, { onDelete: "cascade" }),
    kind: text("kind", { enum: FINDING_EVENT_KINDS }).notNull(),
    fromStatus: text("from_status", { enum: FINDING_STATUSES }),
    toStatus: text("to_status", { enum: FINDING_STATUSES }),
    note: text("note"),
    /** Null for events the assessment itself records. */
    actorId: integer("actor_id").references(() => users.id, { onDelete: "set null" }),
    data: text("data", { mode: "json" }).$type<Record<string, unknown>>(),
    at: integer("at", { mode: "timestamp_ms" }).notNull().default(nowMs),
  },
  (t) => [index("finding_events_finding_idx").on(t.findingId, t.at), index("finding_events_actor_idx").on(t.actorId)],
);
export type FindingEvent = typeof findingEvents.$inferSelect;

// ---------------------------------------------------------------------------------------------
// E-mail outbox, audit log, settings, quantity limits, background jobs
// ---------------------------------------------------------------------------------------------


export const emailMessages = sqliteTable(
  "email_messages",
  {
    id: integer("id").primaryKey({ autoIncrement: true }),
    kind: text("kind").notNull(),
    toAddresses: text("to_addresses", { mode: "json" }).$type<string[]>().notNull(),
    subject: text("subject").notNull(),
    html: text("html").notNull(),
    text: text("text").notNull(),
    status: text("status", { enum: EMAIL_STATUSES }).notNull().default("queued"),
    attempts: integer("attempts").notNull().default(0),
    nextAttemptAt: integer("next_attempt_at", { mode: "timestamp_ms" }).notNull().default(nowMs),
    lastError: text("last_error"),
    providerMessageId: text("provider_message_id"),
    /** Sent as the Idempotency-Key header so a retried send is not delivered twice. */
    idempotencyKey: text("idempotency_key").notNull(),
    recipientUserId: integer("recipient_user_id").references(() => users.id, { onDelete: "set null" }),
    createdAt: createdAt(),
    sentAt: integer("sent_at", { mode: "timestamp_ms" }),
  },
  (t) => [
    uniqueIndex("email_messages_idempotency_unique").on(t.idempotencyKey),
    index("email_messages_due_idx").on(t.status, t.nextAttemptAt),
    index("email_messages_recipient_idx").on(t.recipientUserId),
  ],
);
export type EmailMessage = typeof emailMessages.$inferSelect;
export type NewEmailMessage = typeof emailMessages.$inferInsert;

export const auditEvents = sqliteTable(
  "audit_events",
  {
    id: integer("id").primaryKey({ autoIncrement: true }),
    at: integer("at", { mode: "timestamp_ms" }).notNull().default(nowMs),
    actorId: integer("actor_id").references(() => users.id, { onDelete: "set null" }),
    /** Who acted, kept as text too: an e-mail address, "api key …" or "system". */
    actorLabel: text("actor_label").notNull(),
    action: text("action").notNull(),
    entityType: text("entity_type").notNull(),
    entityId: text("entity_id"),
    summary: text("summary").notNull(),
    before: text("before", { mode: "json" }).$type<unknown>(),
    after: text("after", { mode: "json" }).$type<unknown>(),
  },
  (t) => [
    index("audit_events_at_idx").on(t.at),
    index("audit_events_entity_idx").on(t.entityType, t.entityId),
    index("audit_events_actor_idx").on(t.actorId),
  ],
);
export type AuditEvent = typeof auditEvents.$inferSelect;

export const settings = sqliteTable("settings", {
  key: text("key").primaryKey(),
  value: text("value", { mode: "json" }).$type<unknown>().notNull(),
  updatedAt: updatedAt(),
  updatedById: integer("updated_by_id").references(() => users.id, { onDelete: "set null" }),
}, (t) => [index("settings_updated_by_idx").on(t.updatedById)]);


/** Maximum volumes per location kind and liquid class, set by each organisation from its local code. */
export const quantityLimits = sqliteTable(
  "quantity_limits",
  {
    id: integer("id").primaryKey({ autoIncrement: true }),
    scope: text("scope", { enum: QUANTITY_LIMIT_SCOPES }).notNull(),
    /** Liquid classes the limit sums over, e.g. ["IA","IB","IC"]. */
    liquidClasses: text("liquid_classes", { mode: "json" }).$type<LiquidClass[]>().notNull(),
    maxVolumeL: real("max_volume_l").notNull(),
    /** Allowance when the room is sprinklered, if the code gives one. */
    sprinkleredMaxVolumeL: real("sprinklered_max_volume_l"),
    basis: text("basis").notNull(),
    updatedAt: updatedAt(),
    updatedById: integer("updated_by_id").references(() => users.id, { onDelete: "set null" }),
  },
  (t) => [index("quantity_limits_updated_by_idx").on(t.updatedById), check("quantity_limits_positive", sql`${t.maxVolumeL} > 0`)],
);
export type QuantityLimit = typeof quantityLimits.$inferSelect;


export const jobs = sqliteTable(
  "jobs",
  {
    id: integer("id").primaryKey({ autoIncrement: true }),
    kind: text("kind").notNull(),
    status: text("status", { enum: JOB_STATUSES }).notNull().default("queued"),
    progress: integer("progress").notNull().default(0),
    total: integer("total"),
    error: text("error"),
    requestedById: integer("requested_by_id").references(() => users.id, { onDelete: "set null" }),
    createdAt: createdAt(),
    startedAt: integer("started_at", { mode: "timestamp_ms" }),
    finishedAt: integer("finished_at", { mode: "timestamp_ms" }),
  },
  (t) => [index("jobs_status_idx").on(t.status), index("jobs_requested_by_idx").on(t.requestedById)],
);
export type Job = typeof jobs.$inferSelect;

// ---------------------------------------------------------------------------------------------
// Webhooks: endpoints admins register, and the outbox of signed deliveries (lib/webhooks)
// ---------------------------------------------------------------------------------------------

export const WEBHOOK_DELIVERY_STATUSES = ["pending", "sending", "delivered", "failed"] as const;
export type WebhookDeliveryStatus = (typeof WEBHOOK_DELIVERY_STATUSES)[number];

export const webhookEndpoints = sqliteTable(
  "webhook_endpoints",
  {
    id: integer("id").primaryKey({ autoIncrement: true }),
    url: text("url").notNull(),
    description: text("description").notNull(),
    /** The event types it receives (lib/webhooks/events.ts). */
    events: text("events", { mode: "json" }).$type<string[]>().notNull(),
    /** The admin's explicit choice: private, loopback and link-local addresses may be reached. */
    allowPrivate: integer("allow_private", { mode: "boolean" }).notNull().default(false),
    active: integer("active", { mode: "boolean" }).notNull().default(true),
    /** The signing secret, AES-256-GCM under a key derived from SESSION_SECRET (lib/webhooks/secret.ts); never shown again. */
    secretEncrypted: text("secret_encrypted").notNull(),
    secretRotatedAt: integer("secret_rotated_at", { mode: "timestamp_ms" }),
    createdById: integer("created_by_id").references(() => users.id, { onDelete: "set null" }),
    createdAt: createdAt(),
    updatedAt: updatedAt(),
  },
  (t) => [index("webhook_endpoints_active_idx").on(t.active), index("webhook_endpoints_created_by_idx").on(t.createdById)],
);
export type WebhookEndpoint = typeof webhookEndpoints.$inferSelect;

/** One event for one endpoint. Never deleted by the delivery job; `message_id` is the webhook-id of every attempt. */
export const webhookDeliveries = sqliteTable(
  "webhook_deliveries",
  {
    id: integer("id").primaryKey({ autoIncrement: true }),
    endpointId: integer("endpoint_id")
      .notNull()
      .references(() => webhookEndpoints.id, { onDelete: "restrict" }),
    messageId: text("message_id").notNull(),
    eventType: text("event_type").notNull(),
    /** The exact JSON body that is signed and sent. */
    payload: text("payload").notNull(),
    status: text("status", { enum: WEBHOOK_DELIVERY_STATUSES }).notNull().default("pending"),
    attempts: integer("attempts").notNull().default(0),
    nextAttemptAt: integer("next_attempt_at", { mode: "timestamp_ms" }).notNull().default(nowMs),
    /** While "sending": the claim's token and when it lapses (a crashed sender's claim becomes due again). */
    claimToken: text("claim_token"),
    leaseUntil: integer("lease_until", { mode: "timestamp_ms" }),
    lastStatusCode: integer("last_status_code"),
    lastError: text("last_error"),
    createdAt: createdAt(),
    deliveredAt: integer("delivered_at", { mode: "timestamp_ms" }),
  },
  (t) => [
    uniqueIndex("webhook_deliveries_message_unique").on(t.messageId),
    index("webhook_deliveries_due_idx").on(t.status, t.nextAttemptAt),
    index("webhook_deliveries_endpoint_idx").on(t.endpointId, t.id),
  ],
);
export type WebhookDelivery = typeof webhookDeliveries.$inferSelect;

export const webhookAttempts = sqliteTable(
  "webhook_attempts",
  {
    id: integer("id").primaryKey({ autoIncrement: true }),
    deliveryId: integer("delivery_id")
      .notNull()
      .references(() => webhookDeliveries.id, { onDelete: "cascade" }),
    at: integer("at", { mode: "timestamp_ms" }).notNull(),
    durationMs: integer("duration_ms").notNull(),
    statusCode: integer("status_code"),
    error: text("error"),
    /** The start of the receiver's answer (at most 4 KB), for display. */
    responseBody: text("response_body"),
  },
  (t) => [index("webhook_attempts_delivery_idx").on(t.deliveryId)],
);
export type WebhookAttempt = typeof webhookAttempts.$inferSelect;

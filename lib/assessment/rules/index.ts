// Headroom's assessment rules: pure functions from a location snapshot and the settings to the
// findings they propose. No database, no framework.
export { assessLocation, type AssessOptions } from "./assess";
export { createAssessmentCache, type AssessmentCache } from "./cache";
export { isClosedUnit, isTemperatureControlled } from "./context";
export { findingFingerprint, locationKey, subjectKey, type FindingSubject, type LocationRef } from "./fingerprint";
export { interiorIgnitionSources } from "./ignition-sources";
export { MISSING_DATA_LABELS } from "./missing-data";
export { ASSESSMENT_RULES, RULE_IDS, ruleLabel, type RuleId } from "./rule-ids";
export {
  assessmentSettingsSchema,
  DEFAULT_ASSESSMENT_SETTINGS,
  EXAMPLE_QUANTITY_LIMITS,
  exposureSeverity,
  flashPointSeverity,
  ignitionSeverity,
  isFlammableLiquid,
  lflSeverity,
  MISSING_DATA_KINDS,
  oxygenSeverity,
  quantitySeverity,
  severityRank,
  worseSeverity,
} from "./severity";
export { buildMixtureSnapshot, buildSubstanceSnapshot, quantityLimitFromRow, type SubstanceFields } from "./snapshot";
export type {
  AssessmentSettings,
  CandidateFinding,
  CarbonDioxideLimitSetting,
  FindingTrace,
  LocationSnapshot,
  MissingDataKind,
  MixtureComponentSnapshot,
  MixtureSnapshot,
  PhysicalState,
  PlainCandidateFinding,
  QuantityLimitSetting,
  RoomInfo,
  StoredContent,
  StoredLiquid,
  SubstanceSnapshot,
  TraceContainer,
  UnitInfo,
} from "./types";

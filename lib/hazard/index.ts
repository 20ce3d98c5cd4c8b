// Headroom's physics engine: pure functions, no database, no framework, no I/O.
export { HazardInputError, type HazardErrorCode } from './errors';
export * from './trace';
export {
  GAS_CONSTANT_J_PER_MOL_K,
  KELVIN_OFFSET,
  STANDARD_ATMOSPHERE_KPA,
  KPA_PER_MMHG,
  molarVolumeLPerMol,
  type PressureUnit,
} from './units';
export {
  saturationPressure,
  saturatedConcentration,
  integratedClausiusClapeyron,
  clausiusClapeyronTemperatureC,
  troutonEnthalpyKJPerMol,
  temperatureAtSaturationPressureC,
  evaluateCorrelationKPa,
  validateVaporProperties,
  TROUTON_ENTROPY_J_PER_MOL_K,
  type VaporPressureCorrelation,
  type VaporProperties,
  type SaturationPressureMethod,
  type SaturationPressureResult,
  type SaturatedConcentrationResult,
} from './vapor-pressure';
export { ppmToMgPerM3, mgPerM3ToPpm } from './concentration';
export { selectCorrelation, correlationHandovers, wagnerEquationText, wagnerFormName, type CorrelationHandover } from './vapor-pressure';
export { traceSaturatedConcentration, type PropertySources } from './saturation-trace';
export {
  ghsFlammableCategory,
  nfpaLiquidClass,
  isNfpaFlammableClass,
  type GhsFlammableCategory,
  type NfpaLiquidClass,
} from './classification';
export {
  lowerFlammableTemperatureC,
  leChatelierLflVolPercent,
  leChatelierMixture,
  lflFraction,
  flashPointMargin,
  type LflFractionResult,
} from './flammability';
export {
  exposureRatios,
  exposureLimitPpm,
  additiveExposureIndex,
  type ExposureLimit,
  type ExposureLimitKind,
  type ExposureLimitUnit,
  type ExposureRatio,
} from './limits';
export { massToMoleFractions, raoultMixture, type RaoultComponentResult } from './mixtures';
export {
  enclosureBound,
  type EnclosureBoundResult,
  type EnclosureContainer,
  type EnclosureScenario,
} from './enclosure';
export {
  spillPoolArea,
  epaRmpEvaporationRate,
  mackayMatsuguEvaporationRate,
  EPA_RMP_POOL_DEPTH_M,
  type EvaporationRateResult,
} from './evaporation';
export { wellMixedRoom, type WellMixedRoomResult } from './room';
export {
  rollUpQuantities,
  NFPA_LIQUID_CLASSES,
  type QuantityItem,
  type QuantityLimit,
  type QuantityCheck,
  type QuantityRollUpResult,
} from './quantities';
export {
  liquidNitrogenExpansionRatio,
  liquidNitrogenRelease,
  oxygenAfterRelease,
  oxygenWithSteadyRelease,
  dryIceRelease,
  CARBON_DIOXIDE_NIOSH_LIMITS,
  CARBON_DIOXIDE_MOLAR_MASS_G_PER_MOL,
  NITROGEN_MOLAR_MASS_G_PER_MOL,
  LIQUID_NITROGEN_DENSITY_KG_PER_M3,
  NORMAL_AIR_OXYGEN_PERCENT,
  OXYGEN_DEFICIENCY_PERCENT,
  type OxygenResult,
} from './cryogens';
export { warmUpTemperatureC, warmUpMinutesToReach, type WarmUp } from './warm-up';
export { enclosedSpillTimes, type EnclosedSpillInput, type EnclosedSpillResult, type EnclosedSpillTime } from './enclosed-spill';

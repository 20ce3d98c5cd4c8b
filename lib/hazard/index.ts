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

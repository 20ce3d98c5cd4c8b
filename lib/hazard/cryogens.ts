import type { ExposureLimit } from './limits';
import { traceStep, traceValue, type Trace } from './trace';
import { STANDARD_ATMOSPHERE_KPA, formatSig, molarVolumeLPerMol } from './units';
import { assertNonNegative, assertPositive, assertTempC } from './validate';
import { HazardInputError } from './errors';

/** N₂ molar mass from CIAAW conventional atomic weights (N 14.007). */
export const NITROGEN_MOLAR_MASS_G_PER_MOL = 28.014;
/** CO₂ molar mass from CIAAW conventional atomic weights (C 12.011, O 15.999). */
export const CARBON_DIOXIDE_MOLAR_MASS_G_PER_MOL = 44.009;
/** Liquid-nitrogen density at its normal boiling point, 806.5 kg/m³ (UW-Madison LN₂/LHe facility data). */
export const LIQUID_NITROGEN_DENSITY_KG_PER_M3 = 806.5;
/** Oxygen in normal dry air, % by volume (the baseline used by the oxygen-depletion worksheets). */
export const NORMAL_AIR_OXYGEN_PERCENT = 20.9;
/**
 * Oxygen-deficient atmosphere below 19.5 % O₂ (OSHA 29 CFR 1910.134(d)(2)(iii) and 1910.146).
 * A default the caller may override with its own policy (some use 19 % and 18 % to evacuate).
 */
export const OXYGEN_DEFICIENCY_PERCENT = 19.5;

/** CO₂ limits, NIOSH IDLH documentation for carbon dioxide (May 1994): REL TWA, STEL; revised IDLH. */
export const CARBON_DIOXIDE_NIOSH_LIMITS: readonly ExposureLimit[] = [
  { kind: 'TWA', value: 5000, unit: 'ppm', body: 'NIOSH', source: 'NIOSH REL, IDLH documentation for CO₂ (May 1994), cdc.gov/niosh/idlh/124389.html' },
  { kind: 'STEL', value: 30000, unit: 'ppm', body: 'NIOSH', source: 'NIOSH REL, IDLH documentation for CO₂ (May 1994), cdc.gov/niosh/idlh/124389.html' },
  { kind: 'IDLH', value: 40000, unit: 'ppm', body: 'NIOSH', source: 'NIOSH revised IDLH, IDLH documentation for CO₂ (May 1994), cdc.gov/niosh/idlh/124389.html' },
];

/**
 * Gas volume per volume of liquid nitrogen at a reference temperature: ρ/M × Vm(T, P). With
 * 806.5 kg/m³ it gives ≈ 692 at 20 °C and ≈ 704 at 25 °C; published round figures are 682–700
 * (Univ. of Oxford Safety Office S4/03; OSTI 45495), which is why the reference temperature is an input.
 */
export function liquidNitrogenExpansionRatio(input: {
  liquidDensityKgPerM3?: number;
  referenceTempC?: number;
  pressureKPa?: number;
} = {}): number {
  const density = input.liquidDensityKgPerM3 ?? LIQUID_NITROGEN_DENSITY_KG_PER_M3;
  const tempC = input.referenceTempC ?? 20;
  const pressureKPa = input.pressureKPa ?? STANDARD_ATMOSPHERE_KPA;
  assertPositive(density, 'liquidDensityKgPerM3');
  assertTempC(tempC, 'referenceTempC');
  assertPositive(pressureKPa, 'pressureKPa');
  // mol per litre of liquid × litres of gas per mol
  return (density / NITROGEN_MOLAR_MASS_G_PER_MOL) * molarVolumeLPerMol(tempC, pressureKPa);
}

export type OxygenResult = {
  gasVolumeM3: number;
  oxygenPercent: number;
  deficient: boolean;
  trace: Trace;
};

function validateOxygenSettings(baselineOxygenPercent: number, deficiencyThresholdPercent: number): void {
  assertPositive(baselineOxygenPercent, 'baselineOxygenPercent');
  assertPositive(deficiencyThresholdPercent, 'deficiencyThresholdPercent');
  if (baselineOxygenPercent > 100) {
    throw new HazardInputError('out-of-range', 'baselineOxygenPercent', 'baselineOxygenPercent must not exceed 100 %');
  }
}

/**
 * Oxygen after the instant release of an inert gas volume into a room with no ventilation,
 * the gas displacing an equal volume of air: O₂ = O₂,air × (1 − V_gas/V_room)
 * (Univ. of Oxford Safety Office S4/03 App. 1, after BCGA GN11; the linear form is more
 * conservative than full-mixing dilution, O₂·e^(−V_gas/V_room)).
 *
 * The displacement form describes a release smaller than the room. When the gas released is as
 * large as the room or larger, it would give zero or less: a room is not gas-tight, and the gas
 * pushes out what is already there, mixed with it, so the room average follows the well-mixed
 * dilution O₂ = O₂,air × e^(−V_gas/V_room) (common practice for a purge by dilution). Near the
 * floor, where cold gas pools, it can be lower still; the trace says so.
 */
export function oxygenAfterRelease(input: {
  gasVolumeM3: number;
  roomVolumeM3: number;
  baselineOxygenPercent?: number;
  deficiencyThresholdPercent?: number;
}): OxygenResult & { exceedsRoomVolume: boolean } {
  assertNonNegative(input.gasVolumeM3, 'gasVolumeM3');
  assertPositive(input.roomVolumeM3, 'roomVolumeM3');
  const baseline = input.baselineOxygenPercent ?? NORMAL_AIR_OXYGEN_PERCENT;
  const threshold = input.deficiencyThresholdPercent ?? OXYGEN_DEFICIENCY_PERCENT;
  validateOxygenSettings(baseline, threshold);
  const volumeRatio = input.gasVolumeM3 / input.roomVolumeM3;
  const exceedsRoomVolume = volumeRatio >= 1;
  const oxygenPercent = exceedsRoomVolume ? baseline * Math.exp(-volumeRatio) : baseline * (1 - volumeRatio);
  const result = traceValue('Oxygen after the release', 'O₂', oxygenPercent, '% by volume');
  const step = exceedsRoomVolume
    ? traceStep(
        'The gas released exceeds the room: it leaves mixed with the room air (well-mixed dilution)',
        'O₂ = O₂,air × e^(−V_gas/V_room)',
        `V_gas/V_room = ${formatSig(input.gasVolumeM3, 5)}/${formatSig(input.roomVolumeM3, 5)} = ${formatSig(volumeRatio, 3)} ≥ 1, so displacement alone would leave no air; O₂ = ${baseline} × e^(−${formatSig(volumeRatio, 4)}) = ${formatSig(oxygenPercent, 3)} %`,
        result,
      )
    : traceStep(
        'Displacement of room air by the released gas',
        'O₂ = O₂,air × (1 − V_gas/V_room)',
        `O₂ = ${baseline} × (1 − ${formatSig(input.gasVolumeM3, 5)}/${formatSig(input.roomVolumeM3, 5)}) = ${formatSig(oxygenPercent, 4)} %`,
        result,
      );
  return {
    gasVolumeM3: input.gasVolumeM3,
    oxygenPercent,
    deficient: oxygenPercent < threshold,
    exceedsRoomVolume,
    trace: {
      method: 'Oxygen depletion after a full release, no ventilation',
      source: exceedsRoomVolume
        ? 'Univ. of Oxford Safety Office Policy S4/03 App. 1 (after BCGA GN11) for releases smaller than the room; beyond the room\'s volume, well-mixed dilution (common practice); threshold OSHA 29 CFR 1910.134'
        : 'Univ. of Oxford Safety Office Policy S4/03 App. 1 (after BCGA GN11): O₂ = 0.21 × (V_room − V_gas)/V_room; threshold OSHA 29 CFR 1910.134',
      inputs: [
        traceValue('Released gas volume', 'V_gas', input.gasVolumeM3, 'm³'),
        traceValue('Room volume', 'V_room', input.roomVolumeM3, 'm³'),
        traceValue('Oxygen in normal air', 'O₂,air', baseline, '%', input.baselineOxygenPercent === undefined ? 'default 20.9 %' : 'input'),
        traceValue('Oxygen-deficiency threshold', 'O₂,min', threshold, '%', input.deficiencyThresholdPercent === undefined ? 'default: OSHA 29 CFR 1910.134, 19.5 %' : 'input'),
      ],
      steps: [step],
      result,
      warnings: exceedsRoomVolume
        ? [
            'Room-average value: at the point of release the oxygen is lower',
            'Cold gas pools near the floor and in pits: there the air can be displaced almost entirely',
          ]
        : ['Room-average value: at the point of release the oxygen is lower'],
    },
  };
}

/** Full loss of a liquid-nitrogen inventory into a room (worst case recommended by BCGA for risk assessment). */
export function liquidNitrogenRelease(input: {
  liquidVolumeL: number;
  roomVolumeM3: number;
  expansionRatio?: number;
  referenceTempC?: number;
  baselineOxygenPercent?: number;
  deficiencyThresholdPercent?: number;
}): OxygenResult & { expansionRatio: number; exceedsRoomVolume: boolean } {
  assertNonNegative(input.liquidVolumeL, 'liquidVolumeL');
  const expansionRatio = input.expansionRatio ?? liquidNitrogenExpansionRatio({ referenceTempC: input.referenceTempC });
  assertPositive(expansionRatio, 'expansionRatio');
  const gasVolumeM3 = (input.liquidVolumeL / 1000) * expansionRatio;
  const oxygen = oxygenAfterRelease({ ...input, gasVolumeM3 });
  const gasStep = traceStep(
    'Gas volume from the liquid volume',
    'V_gas = V_liquid × expansion ratio',
    `V_gas = ${formatSig(input.liquidVolumeL / 1000, 5)} m³ × ${formatSig(expansionRatio, 4)} = ${formatSig(gasVolumeM3, 5)} m³`,
    traceValue('Released gas volume', 'V_gas', gasVolumeM3, 'm³'),
  );
  return {
    ...oxygen,
    expansionRatio,
    trace: {
      ...oxygen.trace,
      method: 'Oxygen depletion after the full loss of a liquid-nitrogen inventory',
      inputs: [
        traceValue('Liquid nitrogen', 'V_liquid', input.liquidVolumeL, 'L'),
        traceValue(
          'Expansion ratio (gas/liquid)',
          'E',
          expansionRatio,
          '',
          input.expansionRatio === undefined
            ? `ρ/M × Vm at ${input.referenceTempC ?? 20} °C with ρ = 806.5 kg/m³ (UW-Madison LN₂ data)`
            : 'input',
        ),
        ...oxygen.trace.inputs,
      ],
      steps: [gasStep, ...oxygen.trace.steps],
    },
  };
}

/**
 * Steady continuous release of an inert gas into a ventilated room (fresh-air dilution):
 * O₂ = O₂,air × (1 − L/(N·V)), L the release rate in m³/h, N the air changes per hour
 * (rearranged from the published leak-rate form ṅ = N·V·(1 − C_f/0.21), casualprocessengineer.com
 * "Oxygen depletion in a fixed volume due to inert gas leak").
 */
export function oxygenWithSteadyRelease(input: {
  gasReleaseM3PerH: number;
  roomVolumeM3: number;
  airChangesPerHour: number;
  baselineOxygenPercent?: number;
  deficiencyThresholdPercent?: number;
}): { oxygenPercent: number; deficient: boolean; trace: Trace } {
  assertNonNegative(input.gasReleaseM3PerH, 'gasReleaseM3PerH');
  assertPositive(input.roomVolumeM3, 'roomVolumeM3');
  assertPositive(input.airChangesPerHour, 'airChangesPerHour');
  const baseline = input.baselineOxygenPercent ?? NORMAL_AIR_OXYGEN_PERCENT;
  const threshold = input.deficiencyThresholdPercent ?? OXYGEN_DEFICIENCY_PERCENT;
  validateOxygenSettings(baseline, threshold);
  const fraction = Math.min(1, input.gasReleaseM3PerH / (input.airChangesPerHour * input.roomVolumeM3));
  const oxygenPercent = baseline * (1 - fraction);
  const result = traceValue('Steady-state oxygen', 'O₂', oxygenPercent, '% by volume');
  return {
    oxygenPercent,
    deficient: oxygenPercent < threshold,
    trace: {
      method: 'Oxygen with a steady inert-gas release and ventilation',
      source: 'Fresh-air dilution of a steady leak, C_f = 0.21·(1 − ṅ/(N·V)), rearranged from ṅ = N·V·(1 − C_f/0.21) (casualprocessengineer.com, oxygen depletion due to inert gas leak)',
      inputs: [
        traceValue('Gas release rate', 'L', input.gasReleaseM3PerH, 'm³/h'),
        traceValue('Room volume', 'V', input.roomVolumeM3, 'm³'),
        traceValue('Air changes per hour', 'N', input.airChangesPerHour, '1/h'),
        traceValue('Oxygen in normal air', 'O₂,air', baseline, '%'),
        traceValue('Oxygen-deficiency threshold', 'O₂,min', threshold, '%'),
      ],
      steps: [
        traceStep(
          'Steady state of release and fresh-air supply',
          'O₂ = O₂,air × (1 − L/(N·V))',
          `O₂ = ${baseline} × (1 − ${formatSig(input.gasReleaseM3PerH, 5)}/(${input.airChangesPerHour} × ${formatSig(input.roomVolumeM3, 5)})) = ${formatSig(oxygenPercent, 4)} %`,
          result,
        ),
      ],
      result,
      warnings: ['Does not account for local depletion at the point of release'],
    },
  };
}

/**
 * Dry ice subliming completely in a room with no ventilation: V_CO₂ = m/M × Vm(T);
 * CO₂ = V_CO₂/V_room × 10⁶ ppm against its exposure limits; O₂ by displacement as above.
 * CO₂ is toxic well before it is an asphyxiant (O₂ reaches 19.5 % only at ≈ 67 000 ppm CO₂).
 */
export function dryIceRelease(input: {
  massKg: number;
  roomVolumeM3: number;
  tempC?: number;
  ambientPressureKPa?: number;
  limits?: readonly ExposureLimit[];
  baselineOxygenPercent?: number;
  deficiencyThresholdPercent?: number;
}): {
  gasVolumeM3: number;
  carbonDioxidePpm: number;
  oxygenPercent: number;
  oxygenDeficient: boolean;
  limitRatios: { limit: ExposureLimit; ratio: number; exceeded: boolean }[];
  trace: Trace;
} {
  assertNonNegative(input.massKg, 'massKg');
  assertPositive(input.roomVolumeM3, 'roomVolumeM3');
  const tempC = input.tempC ?? 20;
  assertTempC(tempC);
  const ambientPressureKPa = input.ambientPressureKPa ?? STANDARD_ATMOSPHERE_KPA;
  assertPositive(ambientPressureKPa, 'ambientPressureKPa');
  const limits = input.limits ?? CARBON_DIOXIDE_NIOSH_LIMITS;
  limits.forEach((limit, i) => {
    assertPositive(limit.value, `limits[${i}].value`);
    if (limit.unit !== 'ppm') throw new HazardInputError('invalid-option', `limits[${i}].unit`, 'CO₂ limits must be given in ppm');
  });
  const molarVolume = molarVolumeLPerMol(tempC, ambientPressureKPa);
  const gasVolumeM3 = ((input.massKg * 1000) / CARBON_DIOXIDE_MOLAR_MASS_G_PER_MOL) * molarVolume / 1000;
  const carbonDioxidePpm = Math.min(1, gasVolumeM3 / input.roomVolumeM3) * 1e6;
  const oxygen = oxygenAfterRelease({
    gasVolumeM3,
    roomVolumeM3: input.roomVolumeM3,
    baselineOxygenPercent: input.baselineOxygenPercent,
    deficiencyThresholdPercent: input.deficiencyThresholdPercent,
  });
  const limitRatios = limits.map((limit) => ({ limit, ratio: carbonDioxidePpm / limit.value, exceeded: carbonDioxidePpm > limit.value }));
  const result = traceValue('CO₂ after full sublimation', 'C_CO₂', carbonDioxidePpm, 'ppm');
  return {
    gasVolumeM3,
    carbonDioxidePpm,
    oxygenPercent: oxygen.oxygenPercent,
    oxygenDeficient: oxygen.deficient,
    limitRatios,
    trace: {
      method: 'Dry ice subliming in a closed room',
      source: 'Ideal-gas volume of the sublimed CO₂; CO₂ ppm = V_CO₂/V_room × 10⁶ (Univ. of Maine at Fort Kent, "Dry Ice: The Cold Facts"; Univ. of York Biology, Dry ice); limits NIOSH IDLH documentation (1994) unless configured',
      inputs: [
        traceValue('Dry ice', 'm', input.massKg, 'kg'),
        traceValue('Room volume', 'V_room', input.roomVolumeM3, 'm³'),
        traceValue('Room temperature', 'T', tempC, '°C', input.tempC === undefined ? 'default 20 °C' : 'input'),
        traceValue('Molar mass of CO₂', 'M', CARBON_DIOXIDE_MOLAR_MASS_G_PER_MOL, 'g/mol', 'CIAAW atomic weights'),
        ...limits.map((limit) => traceValue(`CO₂ ${limit.body ?? ''} ${limit.kind}`.replace('  ', ' '), `L_${limit.kind}`, limit.value, 'ppm', limit.source)),
      ],
      steps: [
        traceStep(
          'Volume of CO₂ gas',
          'V_CO₂ = (m/M)·Vm, Vm = R·T/P',
          `V_CO₂ = (${formatSig(input.massKg * 1000, 5)}/${CARBON_DIOXIDE_MOLAR_MASS_G_PER_MOL}) × ${formatSig(molarVolume, 5)} L = ${formatSig(gasVolumeM3, 5)} m³`,
          traceValue('CO₂ gas volume', 'V_CO₂', gasVolumeM3, 'm³'),
        ),
        traceStep(
          'CO₂ concentration in the room',
          'C = V_CO₂/V_room × 10⁶',
          `C = ${formatSig(gasVolumeM3, 5)}/${formatSig(input.roomVolumeM3, 5)} × 10⁶ = ${formatSig(carbonDioxidePpm, 5)} ppm`,
          result,
        ),
        ...oxygen.trace.steps,
        ...limitRatios.map((item) =>
          traceStep(
            `Ratio to the ${item.limit.kind}`,
            'r = C/L',
            `r = ${formatSig(carbonDioxidePpm, 5)}/${item.limit.value} = ${formatSig(item.ratio, 4)}`,
            traceValue(`Ratio to ${item.limit.kind}`, 'r', item.ratio, ''),
          ),
        ),
      ],
      result,
      warnings: [
        'Worst case: all stored dry ice sublimes with no ventilation; concentrations near the source are higher, and CO₂ collects at floor level',
      ],
    },
  };
}

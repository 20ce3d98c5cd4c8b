import { HazardInputError } from './errors';
import { traceSaturatedConcentration, type PropertySources } from './saturation-trace';
import { traceStep, traceValue, type Trace } from './trace';
import { STANDARD_ATMOSPHERE_KPA, formatSig, molarVolumeLPerMol } from './units';
import { assertNonEmpty, assertNonNegative, assertPositive } from './validate';
import type { VaporProperties } from './vapor-pressure';

export type EnclosureScenario = 'largest-container' | 'all-open-containers' | 'all-containers';

export type EnclosureContainer = { label?: string; massG: number; open: boolean };

export type EnclosureBoundResult = {
  /** C = min(C_sat, C_inv). */
  concentrationPpm: number;
  concentrationMgPerM3: number;
  saturatedPpm: number;
  /** Concentration if the whole releasable mass evaporated into the free volume. */
  inventoryPpm: number;
  limitedBy: 'saturation' | 'inventory';
  releasableMassG: number;
  boils: boolean;
  trace: Trace;
};

function releasableMassG(containers: EnclosureContainer[], scenario: EnclosureScenario): number {
  switch (scenario) {
    case 'largest-container':
      return containers.reduce((largest, container) => Math.max(largest, container.massG), 0);
    case 'all-open-containers':
      return containers.reduce((sum, container) => sum + (container.open ? container.massG : 0), 0);
    case 'all-containers':
      return containers.reduce((sum, container) => sum + container.massG, 0);
    default:
      throw new HazardInputError('invalid-option', 'scenario', `Unknown enclosure scenario "${String(scenario)}"`);
  }
}

/**
 * Closed-enclosure worst case for one substance in a unit's free volume: the vapor cannot exceed
 * the saturation concentration, nor the concentration reached if the releasable inventory
 * evaporated completely: C = min(C_sat, m·Vm/(M·V_free)) (after Popendorf's closed-room worst case,
 * Taylor & Francis, ISBN 9781351238052). A bound ("maximum possible"), not an expected value.
 */
export function enclosureBound(input: {
  props: VaporProperties;
  substanceName?: string;
  propertySources?: PropertySources;
  tempC: number;
  tempSource?: string;
  freeVolumeM3: number;
  containers: EnclosureContainer[];
  scenario: EnclosureScenario;
  ambientPressureKPa?: number;
}): EnclosureBoundResult {
  assertPositive(input.freeVolumeM3, 'freeVolumeM3');
  assertNonEmpty(input.containers, 'containers');
  input.containers.forEach((container, i) => assertNonNegative(container.massG, `containers[${i}].massG`));
  const ambientPressureKPa = input.ambientPressureKPa ?? STANDARD_ATMOSPHERE_KPA;
  const saturation = traceSaturatedConcentration({
    props: input.props,
    tempC: input.tempC,
    ambientPressureKPa,
    substanceName: input.substanceName,
    propertySources: input.propertySources,
    tempSource: input.tempSource,
  });
  const massG = releasableMassG(input.containers, input.scenario);
  const molarVolume = molarVolumeLPerMol(input.tempC, ambientPressureKPa);
  const molarMass = input.props.molarMassGPerMol;
  // C_inv = (m/M)·Vm / (1000·V_free) × 10⁶ ppm: litres of vapor per litre of free air.
  const inventoryPpm = Math.min(1e6, (((massG / molarMass) * molarVolume) / (1000 * input.freeVolumeM3)) * 1e6);
  const saturatedPpm = saturation.result.ppm;
  const limitedBy = inventoryPpm < saturatedPpm ? 'inventory' : 'saturation';
  const concentrationPpm = Math.min(inventoryPpm, saturatedPpm);
  const concentrationMgPerM3 = (concentrationPpm * molarMass) / molarVolume;
  const result = traceValue('Worst-case concentration in the enclosure', 'C_max', concentrationPpm, 'ppm');
  const scenarioText = {
    'largest-container': 'the largest container',
    'all-open-containers': 'all open containers',
    'all-containers': 'every container',
  }[input.scenario];
  return {
    concentrationPpm,
    concentrationMgPerM3,
    saturatedPpm,
    inventoryPpm,
    limitedBy,
    releasableMassG: massG,
    boils: saturation.result.boils,
    trace: {
      method: 'Closed-enclosure bound',
      source: 'C = min(C_sat, m·Vm/(M·V_free)) (closed-room worst case after Popendorf, Taylor & Francis, ISBN 9781351238052)',
      inputs: [
        ...saturation.trace.inputs,
        traceValue('Free volume of the enclosure', 'V_free', input.freeVolumeM3, 'm³'),
        traceValue('Release scenario', 'scenario', scenarioText, ''),
        ...input.containers.map((container, i) =>
          traceValue(`Liquid in ${container.label ?? `container ${i + 1}`}${container.open ? ' (open)' : ''}`, `m${i + 1}`, container.massG, 'g'),
        ),
      ],
      steps: [
        ...saturation.trace.steps,
        traceStep(
          `Releasable mass: ${scenarioText}`,
          input.scenario === 'largest-container' ? 'm = max(mᵢ)' : 'm = Σ mᵢ',
          `m = ${formatSig(massG, 5)} g`,
          traceValue('Releasable mass', 'm', massG, 'g'),
        ),
        traceStep(
          'Concentration if all of it evaporated into the free volume',
          'C_inv = (m/M)·Vm / (1000·V_free) × 10⁶',
          `C_inv = (${formatSig(massG, 5)}/${molarMass}) × ${formatSig(molarVolume, 5)} / (1000 × ${formatSig(input.freeVolumeM3, 4)}) × 10⁶ = ${formatSig(inventoryPpm, 5)} ppm`,
          traceValue('Inventory-limited concentration', 'C_inv', inventoryPpm, 'ppm'),
        ),
        traceStep(
          `The smaller of the two (${limitedBy === 'inventory' ? 'inventory-limited' : 'saturation-limited'})`,
          'C_max = min(C_sat, C_inv)',
          `C_max = min(${formatSig(saturatedPpm, 5)}, ${formatSig(inventoryPpm, 5)}) = ${formatSig(concentrationPpm, 5)} ppm = ${formatSig(concentrationMgPerM3, 5)} mg/m³`,
          result,
        ),
      ],
      result,
      warnings: [
        ...saturation.trace.warnings,
        'A bound ("maximum possible"), reached only at equilibrium in a closed unit; door openings and ventilation lower it, local pockets can exceed the average',
      ],
    },
  };
}

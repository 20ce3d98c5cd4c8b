import { ghsFlammableCategory, nfpaLiquidClass, type GhsFlammableCategory, type NfpaLiquidClass } from './classification';
import { HazardInputError } from './errors';
import { traceStep, traceValue, type Trace } from './trace';
import { formatSig } from './units';
import { assertFinite, assertNonNegative, assertPositive } from './validate';

export const NFPA_LIQUID_CLASSES: readonly NfpaLiquidClass[] = ['IA', 'IB', 'IC', 'II', 'IIIA', 'IIIB'];

export type QuantityItem = {
  label?: string;
  volumeL: number;
  /** Closed-cup flash point; with the boiling point it gives the class. */
  flashPointC?: number;
  boilingPointC?: number;
};

/**
 * A configured quantity limit (an organisation's own row from its fire code, e.g. a cabinet's
 * Category 1–3 maximum or a control area's Class IA+IB+IC MAQ). Limits are always inputs: the
 * codes differ by edition, jurisdiction, occupancy, floor and sprinklers.
 */
export type QuantityLimit = {
  name: string;
  maxVolumeL: number;
  /** Counts items of these NFPA 30 classes… */
  nfpaClasses?: NfpaLiquidClass[];
  /** …or of these GHS/OSHA categories. */
  ghsCategories?: GhsFlammableCategory[];
  source?: string;
};

export type QuantityCheck = { limit: QuantityLimit; totalL: number; ratio: number; exceeded: boolean };

export type QuantityRollUpResult = {
  totalsByNfpaClassL: Record<NfpaLiquidClass, number>;
  totalsByGhsCategoryL: Record<'1' | '2' | '3' | '4', number>;
  /** Items without a flash point or boiling point (not classed here: not flammable, or data missing). */
  unclassifiedL: number;
  checks: QuantityCheck[];
  trace: Trace;
};

/**
 * Sum of liquid volume by NFPA 30 class and GHS category for one room, cabinet or control area,
 * checked against the configured limits (NFPA 30, NFPA 45, OSHA 29 CFR 1910.106(d)(3); the figures depend
 * on the code edition and the jurisdiction, so they are settings).
 */
export function rollUpQuantities(input: { items: QuantityItem[]; limits: QuantityLimit[] }): QuantityRollUpResult {
  if (!Array.isArray(input.items)) throw new HazardInputError('empty-input', 'items', 'items must be an array');
  if (!Array.isArray(input.limits)) throw new HazardInputError('empty-input', 'limits', 'limits must be an array');
  const totalsByNfpaClassL: Record<NfpaLiquidClass, number> = { IA: 0, IB: 0, IC: 0, II: 0, IIIA: 0, IIIB: 0 };
  const totalsByGhsCategoryL: Record<'1' | '2' | '3' | '4', number> = { '1': 0, '2': 0, '3': 0, '4': 0 };
  let unclassifiedL = 0;
  const warnings: string[] = [];
  input.items.forEach((item, i) => {
    assertNonNegative(item.volumeL, `items[${i}].volumeL`);
    if (item.flashPointC === undefined || item.boilingPointC === undefined) {
      unclassifiedL += item.volumeL;
      return;
    }
    assertFinite(item.flashPointC, `items[${i}].flashPointC`);
    assertFinite(item.boilingPointC, `items[${i}].boilingPointC`);
    totalsByNfpaClassL[nfpaLiquidClass(item.flashPointC, item.boilingPointC)] += item.volumeL;
    const category = ghsFlammableCategory(item.flashPointC, item.boilingPointC);
    if (category !== null) totalsByGhsCategoryL[String(category) as '1' | '2' | '3' | '4'] += item.volumeL;
  });
  if (unclassifiedL > 0) {
    warnings.push(`${formatSig(unclassifiedL, 4)} L without a flash point or boiling point were not classed`);
  }
  const checks = input.limits.map((limit, i) => {
    assertPositive(limit.maxVolumeL, `limits[${i}].maxVolumeL`);
    const nfpa = limit.nfpaClasses ?? [];
    const ghs = limit.ghsCategories ?? [];
    if (nfpa.length === 0 && ghs.length === 0) {
      throw new HazardInputError('empty-input', `limits[${i}]`, `Limit "${limit.name}" names no liquid class or category`);
    }
    const totalL =
      nfpa.reduce((sum, liquidClass) => sum + totalsByNfpaClassL[liquidClass], 0) +
      ghs.reduce((sum, category) => sum + totalsByGhsCategoryL[String(category) as '1' | '2' | '3' | '4'], 0);
    const ratio = totalL / limit.maxVolumeL;
    return { limit, totalL, ratio, exceeded: totalL > limit.maxVolumeL };
  });
  const exceeded = checks.filter((check) => check.exceeded).length;
  const result = traceValue('Limits exceeded', 'n', exceeded, '');
  return {
    totalsByNfpaClassL,
    totalsByGhsCategoryL,
    unclassifiedL,
    checks,
    trace: {
      method: 'Quantity roll-up by liquid class',
      source: 'Classes: NFPA 30 and GHS/OSHA 29 CFR 1910.106(a)(19); limits: the organisation\'s configured rows',
      inputs: [
        ...input.items.map((item, i) =>
          traceValue(
            item.label ?? `item ${i + 1}`,
            `V${i + 1}`,
            item.volumeL,
            'L',
            item.flashPointC === undefined || item.boilingPointC === undefined
              ? 'unclassed'
              : `FP ${item.flashPointC} °C, BP ${item.boilingPointC} °C → ${nfpaLiquidClass(item.flashPointC, item.boilingPointC)}`,
          ),
        ),
        ...input.limits.map((limit) => traceValue(limit.name, 'L_max', limit.maxVolumeL, 'L', limit.source)),
      ],
      steps: checks.map((check) =>
        traceStep(
          `Total against "${check.limit.name}"`,
          `V = Σ V over ${[...(check.limit.nfpaClasses ?? []), ...(check.limit.ghsCategories ?? []).map((c) => `Cat ${c}`)].join(', ')}`,
          `V = ${formatSig(check.totalL, 5)} L of ${formatSig(check.limit.maxVolumeL, 5)} L (${formatSig(check.ratio * 100, 3)} %)`,
          traceValue(check.limit.name, 'V', check.totalL, 'L'),
        ),
      ),
      result,
      warnings,
    },
  };
}

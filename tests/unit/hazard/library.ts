import { substanceLibrary, type SubstanceSeed } from '@/db/seed/substance-library';
import type { VaporProperties } from '@/lib/hazard';

/** Looks a seeded substance up by CAS number; throws so a typo fails loudly. */
export function seedByCas(cas: string): SubstanceSeed {
  const seed = substanceLibrary.find((entry) => entry.cas === cas);
  if (!seed) throw new Error(`No seeded substance with CAS ${cas}`);
  return seed;
}

/** The seeded substance as the engine's input. */
export function propsOf(seed: SubstanceSeed): VaporProperties {
  return {
    molarMassGPerMol: seed.molarMassGPerMol,
    correlations: seed.correlations,
    normalBoilingPointC: seed.normalBoilingPointC,
    enthalpyOfVaporizationKJPerMol: seed.enthalpyOfVaporizationKJPerMol,
    meltingPointC: seed.meltingPointC,
    flashPointC: seed.flashPointC,
    lflVolPercent: seed.lflVolPercent,
    uflVolPercent: seed.uflVolPercent,
  };
}

export function propsByCas(cas: string): VaporProperties {
  return propsOf(seedByCas(cas));
}

export const CAS = {
  acetone: '67-64-1',
  methanol: '67-56-1',
  ethanol: '64-17-5',
  benzene: '71-43-2',
  toluene: '108-88-3',
  water: '7732-18-5',
  diethylEther: '60-29-7',
  acetaldehyde: '75-07-0',
  nHexane: '110-54-3',
  pyridine: '110-86-1',
  dichloromethane: '75-09-2',
  aceticAcid: '64-19-7',
  dioxane: '123-91-1',
  carbonDioxide: '124-38-9',
  nitrogen: '7727-37-9',
  dmso: '67-68-5',
  isopentane: '78-78-4',
  nPentane: '109-66-0',
} as const;

/** |actual/expected − 1|, the relative deviation used throughout with stated tolerances. */
export function relativeDeviation(actual: number, expected: number): number {
  return Math.abs(actual / expected - 1);
}

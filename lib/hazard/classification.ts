import { assertFinite } from './validate';

export type GhsFlammableCategory = 1 | 2 | 3 | 4;
export type NfpaLiquidClass = 'IA' | 'IB' | 'IC' | 'II' | 'IIIA' | 'IIIB';

/**
 * UN GHS flammable-liquid category (GHS ch. 2.6; the same criteria as OSHA 29 CFR
 * 1910.106(a)(19) and HCS Appendix B.6):
 * 1: FP < 23 °C and IBP ≤ 35 °C; 2: FP < 23 °C and IBP > 35 °C; 3: 23 ≤ FP ≤ 60 °C;
 * 4: 60 < FP ≤ 93 °C; above 93 °C not a flammable liquid (null). EU CLP has no Category 4:
 * callers applying CLP treat 4 as "not classified".
 */
export function ghsFlammableCategory(flashPointC: number, initialBoilingPointC: number): GhsFlammableCategory | null {
  assertFinite(flashPointC, 'flashPointC');
  assertFinite(initialBoilingPointC, 'initialBoilingPointC');
  if (flashPointC < 23) return initialBoilingPointC <= 35 ? 1 : 2;
  if (flashPointC <= 60) return 3;
  if (flashPointC <= 93) return 4;
  return null;
}

// NFPA 30 defines its classes in °F; the Celsius limits are the exact conversions
// (73 °F = 22.78 °C, 100 °F = 37.78 °C, 140 °F = 60 °C, 200 °F = 93.33 °C), not the rounded
// 22.8/37.8/93 °C some tables print.
const F73_IN_C = ((73 - 32) * 5) / 9;
const F100_IN_C = ((100 - 32) * 5) / 9;
const F140_IN_C = ((140 - 32) * 5) / 9;
const F200_IN_C = ((200 - 32) * 5) / 9;

/**
 * NFPA 30 (also NFPA 45, IFC) liquid class from the closed-cup flash point and the boiling point:
 * IA: FP < 73 °F, BP < 100 °F; IB: FP < 73 °F, BP ≥ 100 °F; IC: 73 ≤ FP < 100 °F;
 * II: 100 ≤ FP < 140 °F; IIIA: 140 ≤ FP < 200 °F; IIIB: FP ≥ 200 °F.
 */
export function nfpaLiquidClass(flashPointC: number, boilingPointC: number): NfpaLiquidClass {
  assertFinite(flashPointC, 'flashPointC');
  assertFinite(boilingPointC, 'boilingPointC');
  if (flashPointC < F73_IN_C) return boilingPointC < F100_IN_C ? 'IA' : 'IB';
  if (flashPointC < F100_IN_C) return 'IC';
  if (flashPointC < F140_IN_C) return 'II';
  if (flashPointC < F200_IN_C) return 'IIIA';
  return 'IIIB';
}

/** Flammable (Class I) or combustible (Class II, III) in NFPA 30 wording. */
export function isNfpaFlammableClass(liquidClass: NfpaLiquidClass): boolean {
  return liquidClass === 'IA' || liquidClass === 'IB' || liquidClass === 'IC';
}

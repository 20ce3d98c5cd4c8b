/**
 * A mixture's component fractions (mass or mole) must sum to 1. Recipes are usually written with
 * fractions rounded to two or three decimals (e.g. 0.333 × 3 = 0.999), so a sum within
 * FRACTION_SUM_TOLERANCE of 1 is accepted; anything further off is an error naming the sum.
 */
export const FRACTION_SUM_TOLERANCE = 0.005;

export type FractionCheck = { ok: true; sum: number } | { ok: false; sum: number; message: string };

export function checkFractionSum(fractions: number[]): FractionCheck {
  const sum = fractions.reduce((total, f) => total + f, 0);
  const rounded = Math.round(sum * 10_000) / 10_000;
  if (fractions.length === 0) return { ok: false, sum: 0, message: "Add at least one component." };
  if (fractions.some((f) => !Number.isFinite(f) || f <= 0 || f > 1)) {
    return { ok: false, sum: rounded, message: "Each fraction must be more than 0 and at most 1." };
  }
  if (Math.abs(sum - 1) > FRACTION_SUM_TOLERANCE) {
    return {
      ok: false,
      sum: rounded,
      message: `The fractions add up to ${rounded}; they must add up to 1 (within ±${FRACTION_SUM_TOLERANCE}).`,
    };
  }
  return { ok: true, sum: rounded };
}

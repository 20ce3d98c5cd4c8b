import { describe, expect, it } from "vitest";
import { checkFractionSum, FRACTION_SUM_TOLERANCE } from "@/lib/mixtures/fractions";
import { mixtureCreateSchema } from "@/lib/mixtures/schemas";

describe("mixture fraction check", () => {
  it("accepts fractions that sum to exactly 1 and recipes rounded to three decimals", () => {
    expect(checkFractionSum([0.5, 0.5])).toEqual({ ok: true, sum: 1 });
    expect(checkFractionSum([0.333, 0.333, 0.333])).toEqual({ ok: true, sum: 0.999 });
    expect(checkFractionSum([0.6, 0.25, 0.15])).toEqual({ ok: true, sum: 1 });
  });

  it(`rejects sums further than ±${FRACTION_SUM_TOLERANCE} from 1, naming the sum`, () => {
    expect(checkFractionSum([0.5, 0.4])).toMatchObject({ ok: false, sum: 0.9, message: expect.stringContaining("add up to 0.9") });
    expect(checkFractionSum([0.7, 0.4])).toMatchObject({ ok: false, sum: 1.1 });
    expect(checkFractionSum([0.5, 0.494])).toMatchObject({ ok: false });
    expect(checkFractionSum([0.5, 0.4951])).toMatchObject({ ok: true });
  });

  it("rejects empty lists and fractions outside (0, 1]", () => {
    expect(checkFractionSum([])).toMatchObject({ ok: false, message: "Add at least one component." });
    expect(checkFractionSum([1.2, -0.2])).toMatchObject({ ok: false, message: expect.stringContaining("more than 0 and at most 1") });
    expect(checkFractionSum([Number.NaN, 1])).toMatchObject({ ok: false });
  });

  it("the mixture schema reports the sum on the components field and duplicates on their row", () => {
    const result = mixtureCreateSchema.safeParse({
      name: "Halogenated waste",
      fractionBasis: "mass",
      components: [
        { substanceId: 3, fraction: 0.5 },
        { substanceId: 3, fraction: 0.3 },
      ],
    });
    expect(result.success).toBe(false);
    const paths = result.error!.issues.map((i) => i.path.join("."));
    expect(paths).toContain("components");
    expect(paths).toContain("components.1.substanceId");
  });
});

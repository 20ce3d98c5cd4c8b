import { z } from "zod";
import { FRACTION_BASES } from "@/db/enums";
import { optionalText, requiredId, requiredNumber, requiredText } from "@/lib/validation/fields";
import { listQuerySchema } from "@/lib/http/list-query";
import { checkFractionSum } from "./fractions";

export const mixtureCreateSchema = z
  .object({
    name: requiredText("Name", 120),
    description: optionalText("Description", 1000),
    fractionBasis: z.enum(FRACTION_BASES, { error: "Choose mass or mole fractions." }),
    components: z
      .preprocess(
        // Blank rows of the form (no substance and no fraction) are not components.
        (rows) => (Array.isArray(rows) ? rows.filter((r) => r && typeof r === "object" && ((r as Record<string, unknown>).substanceId || (r as Record<string, unknown>).fraction)) : rows),
        z.array(
        z.object({
          substanceId: requiredId("substance"),
          fraction: requiredNumber({ label: "Fraction", exclusiveMin: 0, max: 1 }),
        }),
        { error: "Add the mixture's components." },
      )
      .min(1, "Add at least one component.")
      .max(20, "A mixture has at most 20 components.")),
  })
  .superRefine((value, ctx) => {
    const seen = new Set<number>();
    value.components.forEach((component, index) => {
      if (seen.has(component.substanceId)) {
        ctx.addIssue({ code: "custom", path: ["components", index, "substanceId"], message: "This substance is listed twice." });
      }
      seen.add(component.substanceId);
    });
    const check = checkFractionSum(value.components.map((c) => c.fraction));
    if (!check.ok) ctx.addIssue({ code: "custom", path: ["components"], message: check.message });
  });

export type MixtureInput = z.output<typeof mixtureCreateSchema>;

export const mixtureListQuerySchema = listQuerySchema({
  sortable: ["name", "createdAt"],
  defaultSort: "name",
  filters: { q: z.string().trim().max(100, "q is at most 100 characters.").optional() },
});

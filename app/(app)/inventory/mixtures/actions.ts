"use server";
import { revalidatePath } from "next/cache";
import { formAction } from "@/lib/auth/form-action";
import { mixtureCreateSchema } from "@/lib/mixtures/schemas";
import { createMixture } from "@/lib/mixtures/service";

export const createMixtureAction = formAction({ action: "mixtures.write", schema: mixtureCreateSchema }, async ({ user, input }) => {
  const mixture = createMixture(user, input);
  revalidatePath("/inventory/mixtures");
  return `Defined ${mixture.name}. Containers of it can now be logged.`;
});

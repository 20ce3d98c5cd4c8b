"use server";
import { revalidatePath } from "next/cache";
import { redirect } from "next/navigation";
import { formAction } from "@/lib/auth/form-action";
import { substanceCreateSchema, substanceEditFormSchema, substanceRetireFormSchema } from "@/lib/substances/schemas";
import { createSubstance, setSubstanceRetired, updateSubstance } from "@/lib/substances/service";

export const createSubstanceAction = formAction({ action: "substances.write", schema: substanceCreateSchema }, async ({ user, input }) => {
  const created = createSubstance(user, input);
  redirect(`/substances/${created.id}`);
});

export const updateSubstanceAction = formAction({ action: "substances.write", schema: substanceEditFormSchema, emptiedClears: true }, async ({ user, input }) => {
  const { id, ...values } = input;
  updateSubstance(user, id, values);
  revalidatePath(`/substances/${id}`);
  redirect(`/substances/${id}?saved=1`);
});

export const retireSubstanceAction = formAction({ action: "substances.write", schema: substanceRetireFormSchema }, async ({ user, input }) => {
  setSubstanceRetired(user, input.id, input.retired);
  revalidatePath(`/substances/${input.id}`);
  return input.retired ? "Retired from the library." : "Restored to the library.";
});

"use server";
import { revalidatePath } from "next/cache";
import { redirect } from "next/navigation";
import { formAction } from "@/lib/auth/form-action";
import { containerCreateSchema, containerEditFormSchema, containerMoveSchema, containerStateSchema } from "@/lib/inventory/schemas";
import { createContainer, moveContainer, setContainerState, updateContainer } from "@/lib/inventory/service";
import { z } from "zod";
import { findContainerIdByLabel } from "@/db/queries/containers";
import { ValidationError } from "@/lib/errors";

const containerId = { id: z.coerce.number().int().positive() };

export const createContainerAction = formAction({ action: "containers.write", schema: containerCreateSchema }, async ({ user, scope, input }) => {
  const container = createContainer(user, scope, input);
  revalidatePath("/inventory");
  redirect(`/inventory/${container.id}?saved=created`);
});

export const updateContainerAction = formAction({ action: "containers.write", schema: containerEditFormSchema, emptiedClears: true }, async ({ user, scope, input }) => {
  const { id, ...changes } = input;
  // The owner list's empty choice reads "Me".
  updateContainer(user, scope, id, changes.ownerId === null ? { ...changes, ownerId: user.id } : changes);
  revalidatePath(`/inventory/${id}`);
  return "Saved.";
});

export const moveContainerAction = formAction({ action: "containers.write", schema: containerMoveSchema.extend(containerId) }, async ({ user, scope, input }) => {
  const moved = moveContainer(user, scope, input.id, input.storageUnitId);
  revalidatePath(`/inventory/${input.id}`);
  return `Moved ${moved.label}.`;
});

export const setStateAction = formAction({ action: "containers.write", schema: containerStateSchema.extend(containerId) }, async ({ user, scope, input }) => {
  setContainerState(user, scope, input.id, input.state);
  revalidatePath(`/inventory/${input.id}`);
  return "Saved.";
});

/** Barcode look-up: a scanner types the label and Enter; this jumps to the container. */
export const lookupLabelAction = formAction({ action: "inventory.read", schema: z.object({ label: z.string({ error: "Scan or type a label." }).trim().min(1, "Scan or type a label.").max(64) }) }, async ({ input }) => {
  const id = findContainerIdByLabel(input.label);
  if (!id) throw new ValidationError(`No container has the label “${input.label}”.`, { label: [`No container has the label “${input.label}”.`] });
  redirect(`/inventory/${id}`);
});

"use server";
import { revalidatePath } from "next/cache";
import { redirect } from "next/navigation";
import { z } from "zod";
import { formAction } from "@/lib/auth/form-action";
import { roomCreateSchema, roomEditFormSchema, siteCreateSchema, storageUnitCreateSchema, storageUnitEditFormSchema } from "@/lib/locations/schemas";
import { createRoom, createSite, createStorageUnit, retireRoom, retireStorageUnit, updateRoom, updateStorageUnit } from "@/lib/locations/service";

export const createSiteAction = formAction({ action: "locations.write", schema: siteCreateSchema }, async ({ user, input }) => {
  const site = createSite(user, input);
  revalidatePath("/locations");
  return `Added site ${site.name}.`;
});

export const createRoomAction = formAction({ action: "locations.write", schema: roomCreateSchema }, async ({ user, input }) => {
  const room = createRoom(user, input);
  redirect(`/locations/rooms/${room.id}`);
});

export const updateRoomAction = formAction({ action: "locations.write", schema: roomEditFormSchema, emptiedClears: true }, async ({ user, input }) => {
  const { id, ...changes } = input;
  updateRoom(user, id, changes);
  revalidatePath(`/locations/rooms/${id}`);
  return "Saved.";
});

export const createUnitAction = formAction({ action: "locations.write", schema: storageUnitCreateSchema }, async ({ user, input }) => {
  const unit = createStorageUnit(user, input);
  revalidatePath(`/locations/rooms/${unit.roomId}`);
  return `Added storage unit ${unit.code}.`;
});

export const updateUnitAction = formAction({ action: "locations.write", schema: storageUnitEditFormSchema, emptiedClears: true }, async ({ user, input }) => {
  const { id, ...changes } = input;
  // An emptied τ reads as null: back to the fitted or default value.
  updateStorageUnit(user, id, changes);
  revalidatePath(`/locations/units/${id}`);
  return "Saved.";
});

const idOnly = z.object({ id: z.coerce.number().int().positive() });

export const retireRoomAction = formAction({ action: "locations.write", schema: idOnly }, async ({ user, input }) => {
  retireRoom(user, input.id);
  redirect("/locations");
});

export const retireUnitAction = formAction({ action: "locations.write", schema: idOnly }, async ({ user, input }) => {
  const unit = retireStorageUnit(user, input.id);
  redirect(`/locations/rooms/${unit.roomId}`);
});

"use server";
import { revalidatePath } from "next/cache";
import { redirect } from "next/navigation";
import { formAction } from "@/lib/auth/form-action";
import { DomainError, ValidationError } from "@/lib/errors";
import { acknowledgeExcursion, acknowledgeExcursions } from "@/lib/temperatures/excursion-store";
import { excursionAcknowledgeFormSchema, excursionsAcknowledgeFormSchema, sensorCreateFormSchema, sensorEditFormSchema, splitLocation } from "@/lib/temperatures/schemas";
import { createSensor, updateSensor } from "@/lib/temperatures/sensors";

/** The forms pick the location in one field; the service names roomId or storageUnitId. */
function onLocationField<T>(write: () => T): T {
  try {
    return write();
  } catch (error) {
    if (error instanceof DomainError && error.fields && ("roomId" in error.fields || "storageUnitId" in error.fields)) {
      const { roomId, storageUnitId, ...rest } = error.fields;
      throw new ValidationError(error.message, { ...rest, location: [...(roomId ?? []), ...(storageUnitId ?? [])] });
    }
    throw error;
  }
}

export const createSensorAction = formAction({ action: "sensors.write", schema: sensorCreateFormSchema }, async ({ user, input }) => {
  const sensor = onLocationField(() => createSensor(user, { externalId: input.externalId, name: input.name, ...splitLocation(input.location) }));
  revalidatePath("/temperatures");
  redirect(`/temperatures/sensors/${sensor.id}`);
});

export const updateSensorAction = formAction({ action: "sensors.write", schema: sensorEditFormSchema }, async ({ user, input }) => {
  const sensor = onLocationField(() =>
    updateSensor(user, input.id, { externalId: input.externalId, name: input.name, active: input.active, ...splitLocation(input.location) }),
  );
  revalidatePath(`/temperatures/sensors/${sensor.id}`);
  revalidatePath("/temperatures");
  return `Saved sensor ${sensor.externalId}.`;
});

export const acknowledgeExcursionAction = formAction({ action: "excursions.acknowledge", schema: excursionAcknowledgeFormSchema }, async ({ user, input }) => {
  const excursion = acknowledgeExcursion(user, input.excursionId, input.comment);
  // The excursion shows on the temperatures area, its sensor's page and its room's and unit's pages.
  revalidatePath("/temperatures", "layout");
  revalidatePath("/locations", "layout");
  return `Acknowledged the excursion that started ${excursion.startAt.toISOString().slice(0, 16).replace("T", " ")} UTC.`;
});

export const acknowledgeExcursionsAction = formAction({ action: "excursions.acknowledge", schema: excursionsAcknowledgeFormSchema }, async ({ user, input }) => {
  const outcomes = acknowledgeExcursions(user, input.excursionIds, input.note ?? null);
  revalidatePath("/temperatures", "layout");
  revalidatePath("/locations", "layout");
  revalidatePath("/");
  const done = outcomes.filter((o) => o.ok).length;
  const refused = outcomes.filter((o) => !o.ok);
  const doneText = `Acknowledged ${done} excursion${done === 1 ? "" : "s"}.`;
  if (refused.length === 0) return doneText;
  const reasons = [...new Set(refused.map((o) => o.error))].join(" ");
  if (done === 0) throw new ValidationError(`None of the ticked excursions was acknowledged: ${reasons}`);
  return `${doneText} ${refused.length} could not be: ${reasons}`;
});

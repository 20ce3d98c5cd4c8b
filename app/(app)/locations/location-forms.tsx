"use client";
import { ConfigForm } from "@/components/forms/config-form";
import { roomCreateSchema, roomEditFormSchema, storageUnitCreateSchema, storageUnitEditFormSchema } from "@/lib/locations/schemas";
import { createRoomAction, createUnitAction, updateRoomAction, updateUnitAction } from "./actions";
import { roomSections, unitSections } from "./location-fields";

type Option = { value: string; label: string };

export function RoomForm({ mode, sites, contacts, values }: { mode: "create" | "edit"; sites: Option[]; contacts: Option[]; values?: Record<string, unknown> }) {
  return mode === "create" ? (
    <ConfigForm id="room-new" schema={roomCreateSchema} action={createRoomAction} sections={roomSections(sites, contacts)} defaultValue={{ kind: "laboratory", sprinklered: "false", mixingFactor: "0.5", ...values }} submitLabel="Add room" />
  ) : (
    <ConfigForm id={`room-${values?.id}`} schema={roomEditFormSchema} action={updateRoomAction} sections={roomSections(sites, contacts)} defaultValue={values} hidden={{ id: Number(values?.id) }} submitLabel="Save room" />
  );
}

export function UnitForm({ mode, roomId, owners, values }: { mode: "create" | "edit"; roomId: number; owners: Option[]; values?: Record<string, unknown> }) {
  return mode === "create" ? (
    <ConfigForm id="unit-new" schema={storageUnitCreateSchema} action={createUnitAction} sections={unitSections(owners)} defaultValue={{ ventilated: "false", ignitionSourceFree: "false", ...values }} hidden={{ roomId }} submitLabel="Add storage unit" />
  ) : (
    <ConfigForm id={`unit-${values?.id}`} schema={storageUnitEditFormSchema} action={updateUnitAction} sections={unitSections(owners)} defaultValue={values} hidden={{ id: Number(values?.id), roomId }} submitLabel="Save storage unit" />
  );
}

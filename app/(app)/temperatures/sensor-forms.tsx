"use client";
import { ConfigForm, type FieldSection } from "@/components/forms/config-form";
import { sensorCreateFormSchema, sensorEditFormSchema } from "@/lib/temperatures/schemas";
import { createSensorAction, updateSensorAction } from "./actions";

type Option = { value: string; label: string; group: string };

function sections(locations: Option[], edit: boolean): FieldSection[] {
  return [
    {
      fields: [
        { name: "externalId", label: "Device id", kind: "text", hint: "Exactly as the logger reports it in its files and API calls." },
        { name: "name", label: "Name", kind: "text", hint: "What people call it, e.g. “Door-side logger”.", span: 2 },
        { name: "location", label: "Attached to", kind: "select", options: locations, placeholder: "Choose a room or storage unit", hint: "The room itself, or one storage unit in it.", span: 2 },
        ...(edit
          ? [{ name: "active", label: "Switched on", kind: "yesno" as const, hint: "Readings for a switched-off sensor are refused; its history stays." }]
          : []),
      ],
    },
  ];
}

export function SensorCreateForm({ locations, location }: { locations: Option[]; location?: string }) {
  return <ConfigForm id="sensor-new" schema={sensorCreateFormSchema} action={createSensorAction} sections={sections(locations, false)} defaultValue={{ location: location ?? "" }} submitLabel="Register sensor" />;
}

export function SensorEditForm({ locations, values }: { locations: Option[]; values: { id: number; externalId: string; name: string; location: string; active: boolean } }) {
  return (
    <ConfigForm
      id={`sensor-${values.id}`}
      schema={sensorEditFormSchema}
      action={updateSensorAction}
      sections={sections(locations, true)}
      defaultValue={{ externalId: values.externalId, name: values.name, location: values.location, active: values.active ? "true" : "false" }}
      hidden={{ id: values.id }}
      submitLabel="Save sensor"
    />
  );
}

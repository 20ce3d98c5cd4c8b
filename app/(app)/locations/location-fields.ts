/** Field layouts of the room and storage-unit forms (client-safe). */
import type { FieldSection } from "@/components/forms/config-form";
import { ROOM_KINDS, STORAGE_UNIT_KINDS } from "@/db/enums";
import { ROOM_KIND_LABELS, STORAGE_UNIT_KIND_LABELS } from "@/lib/format/labels";

type Option = { value: string; label: string };

export function roomSections(sites: Option[], contacts: Option[]): FieldSection[] {
  return [
    {
      legend: "Room",
      fields: [
        { name: "siteId", label: "Site", kind: "select", options: sites, placeholder: "Choose a site" },
        { name: "code", label: "Room code", kind: "text" },
        { name: "name", label: "Name", kind: "text" },
        { name: "kind", label: "Kind", kind: "select", options: ROOM_KINDS.map((k) => ({ value: k, label: ROOM_KIND_LABELS[k] })) },
        { name: "facilitiesContactId", label: "Facilities contact", kind: "select", options: contacts, placeholder: "None" },
        { name: "sprinklered", label: "Sprinklered", kind: "yesno" },
      ],
    },
    {
      legend: "Size and ventilation",
      fields: [
        { name: "floorAreaM2", label: "Floor area (m²)", kind: "number" },
        { name: "heightM", label: "Height (m)", kind: "number" },
        { name: "airChangesPerHour", label: "Air changes per hour", kind: "number", hint: "Mechanical ventilation; 0 for none." },
        { name: "mixingFactor", label: "Mixing factor", kind: "number", hint: "0 < k ≤ 1; 0.5 when unknown (common practice)." },
        { name: "designMaxTempC", label: "Design maximum temperature (°C)", kind: "number", hint: "The hottest the room is designed or known to get." },
      ],
    },
    {
      legend: "Temperature control (walk-in cold rooms)",
      fields: [
        { name: "setMinC", label: "Set range minimum (°C)", kind: "number" },
        { name: "setMaxC", label: "Set range maximum (°C)", kind: "number" },
        { name: "excursionThresholdC", label: "Excursion threshold (°C)", kind: "number" },
        { name: "excursionMinDurationMin", label: "Minimum excursion duration (min)", kind: "number" },
      ],
    },
    { fields: [{ name: "notes", label: "Notes", kind: "textarea", span: 3 }] },
  ];
}

export function unitSections(owners: Option[]): FieldSection[] {
  return [
    {
      legend: "Storage unit",
      fields: [
        { name: "code", label: "Unit code", kind: "text" },
        { name: "name", label: "Name", kind: "text" },
        { name: "kind", label: "Kind", kind: "select", options: STORAGE_UNIT_KINDS.map((k) => ({ value: k, label: STORAGE_UNIT_KIND_LABELS[k] })), placeholder: "Choose a kind" },
        { name: "internalVolumeL", label: "Internal volume (L)", kind: "number" },
        { name: "ventilated", label: "Ventilated", kind: "yesno" },
        { name: "ignitionSourceFree", label: "Interior free of ignition sources", kind: "yesno", hint: "Yes for flammable-storage and explosion-proof refrigerators and cabinets." },
        { name: "ownerId", label: "Owner", kind: "select", options: owners, placeholder: "None" },
      ],
    },
    {
      legend: "Temperature control",
      fields: [
        { name: "setMinC", label: "Set range minimum (°C)", kind: "number" },
        { name: "setMaxC", label: "Set range maximum (°C)", kind: "number" },
        { name: "excursionThresholdC", label: "Excursion threshold (°C)", kind: "number" },
        { name: "excursionMinDurationMin", label: "Minimum excursion duration (min)", kind: "number" },
      ],
    },
    {
      legend: "Warm-up after a failure (refrigerators, freezers, units with a set range)",
      fields: [
        {
          name: "warmUpTauMin",
          label: "Warm-up time constant τ (min)",
          kind: "number",
          hint: "5 to 43,200 min (30 days); 240 is 4 h. Leave empty to use the value fitted to the unit's recorded failures, or the default of its kind.",
        },
        { name: "warmUpTauNote", label: "Why this τ", kind: "text", span: 2, hint: "How it was measured or why it differs from the fit, for whoever reads the unit's assessment." },
      ],
    },
    { fields: [{ name: "notes", label: "Notes", kind: "textarea", span: 3 }] },
  ];
}

"use client";
import { ConfigForm } from "@/components/forms/config-form";
import { alertPreferencesSchema } from "@/lib/users/schemas";
import { updateAlertPreferencesAction } from "./actions";

const DELIVERY = [
  { value: "immediate", label: "As they happen (and in the digest)" },
  { value: "digest", label: "Only in the daily digest" },
  { value: "off", label: "Off" },
];

export function AlertPreferencesForm({ values }: { values: { alertExcursions: string; alertFindings: string; dailyDigest: boolean } }) {
  return (
    <ConfigForm
      id="alert-preferences"
      schema={alertPreferencesSchema}
      action={updateAlertPreferencesAction}
      defaultValue={{ ...values, dailyDigest: String(values.dailyDigest) }}
      submitLabel="Save alert choices"
      sections={[
        {
          fields: [
            { name: "alertExcursions", label: "Excursion alerts", kind: "select", options: DELIVERY, hint: "A storage unit or room above its threshold for its minimum duration, and when it is back." },
            { name: "alertFindings", label: "Finding alerts", kind: "select", options: DELIVERY, hint: "Critical and high findings raised in the register." },
            { name: "dailyDigest", label: "Daily digest", kind: "yesno", hint: "One message a day at 07:00 UTC summing up the last 24 hours for the alerts you have not switched off. Alerts set to “only in the daily digest” are sent in it either way. Nothing is sent on a quiet day." },
          ],
        },
      ]}
    />
  );
}

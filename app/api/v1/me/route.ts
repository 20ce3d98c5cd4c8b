import { NextResponse } from "next/server";
import { route } from "@/lib/http/route";
import { findUserById } from "@/db/queries/users";
import { alertPreferencesSchema } from "@/lib/users/schemas";
import { updateAlertPreferences } from "@/lib/users/service";

function me(id: number) {
  const user = findUserById(id)!;
  return {
    id: user.id,
    email: user.email,
    name: user.name,
    role: user.role,
    alerts: { alertExcursions: user.alertExcursions, alertFindings: user.alertFindings, dailyDigest: user.dailyDigest },
  };
}

export const GET = route({ action: "profile.update" }, ({ user }) => NextResponse.json({ user: me(user.id) }));

/** One's own alert choices: excursions and findings as they happen, in the daily digest, or off. */
export const PATCH = route({ action: "profile.update", schema: alertPreferencesSchema }, ({ user, input }) => {
  updateAlertPreferences(user, input);
  return NextResponse.json({ user: me(user.id) });
});

"use server";
import { revalidatePath } from "next/cache";
import { formAction } from "@/lib/auth/form-action";
import { ssoSettingsSchema } from "@/lib/sso/schemas";
import { saveSsoSettings } from "@/lib/sso/settings";

export const saveSsoSettingsAction = formAction({ action: "settings.manage", schema: ssoSettingsSchema }, async ({ user, input }) => {
  const saved = saveSsoSettings(user, input);
  revalidatePath("/admin/sso");
  return `Saved: ${saved.mappings.length} group rule${saved.mappings.length === 1 ? "" : "s"}; ${
    saved.requireSso ? "single sign-on is required for everyone but the break-glass administrator" : "password sign-in stays open"
  }.`;
});

/** The single sign-on settings form's schema, shared by the admin form (Conform) and its server action. */
import { z } from "zod";
import { ROLES } from "@/lib/auth/roles";

export const MAX_MAPPINGS = 50;
export const MAX_JIT_DOMAINS = 20;

const DOMAIN = /^(?=.{1,253}$)([a-z0-9]([a-z0-9-]{0,61}[a-z0-9])?\.)+[a-z]{2,63}$/;

const mapping = z.object({
  group: z
    .string({ error: "Enter the group's name as the provider sends it." })
    .trim()
    .min(1, "Enter the group's name as the provider sends it.")
    .max(256, "Use at most 256 characters for a group name."),
  role: z.enum(ROLES, { error: "Choose a role for this group." }),
});

/** Domains from a text box: one per line or separated by commas or spaces, lower case, no duplicates. */
const domains = z
  .string()
  .max(5_000, "That list of domains is too long.")
  .optional()
  .transform((text, ctx) => {
    const list = [...new Set((text ?? "").split(/[\s,]+/).map((d) => d.trim().toLowerCase().replace(/^@/, "")).filter(Boolean))];
    const bad = list.find((d) => !DOMAIN.test(d));
    if (bad) {
      ctx.addIssue({ code: "custom", message: `“${bad}” is not a domain; write it like lab.example.org, without the @.` });
      return z.NEVER;
    }
    if (list.length > MAX_JIT_DOMAINS) {
      ctx.addIssue({ code: "custom", message: `List at most ${MAX_JIT_DOMAINS} domains.` });
      return z.NEVER;
    }
    return list;
  });

export const ssoSettingsSchema = z
  .object({
    mappings: z
      .array(mapping)
      .max(MAX_MAPPINGS, `Keep at most ${MAX_MAPPINGS} group rules.`)
      .optional()
      .transform((list) => list ?? []),
    jitDomains: domains,
    requireSso: z
      .union([z.boolean(), z.enum(["true", "false", "on"])])
      .optional()
      .transform((v) => v === true || v === "true" || v === "on"),
    breakGlassUserId: z.coerce.number().int().positive().optional(),
  })
  .superRefine((value, ctx) => {
    const seen = new Set<string>();
    value.mappings.forEach((m, i) => {
      if (seen.has(m.group)) ctx.addIssue({ code: "custom", path: ["mappings", i, "group"], message: `The group “${m.group}” is listed twice; only the first would ever count.` });
      seen.add(m.group);
    });
    if (value.requireSso && !value.breakGlassUserId) {
      ctx.addIssue({ code: "custom", path: ["breakGlassUserId"], message: "Choose the administrator who keeps a password (the break-glass account)." });
    }
  });

export type SsoSettingsInput = z.output<typeof ssoSettingsSchema>;

/** What is stored under the `sso` key of the settings table. */
export type SsoSettings = {
  mappings: { group: string; role: (typeof ROLES)[number] }[];
  jitDomains: string[];
  requireSso: boolean;
  breakGlassUserId: number | null;
};

export const DEFAULT_SSO_SETTINGS: SsoSettings = { mappings: [], jitDomains: [], requireSso: false, breakGlassUserId: null };

/** Reads a stored value defensively: anything malformed falls back to the defaults field by field. */
export const storedSsoSettingsSchema = z.object({
  mappings: z.array(z.object({ group: z.string(), role: z.enum(ROLES) })).catch([]),
  jitDomains: z.array(z.string()).catch([]),
  requireSso: z.boolean().catch(false),
  breakGlassUserId: z.number().int().nullable().catch(null),
});

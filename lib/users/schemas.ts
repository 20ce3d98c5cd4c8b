/** Form schemas for accounts, shared by the forms (Conform) and the server actions. */
import { z } from "zod";
import { ROLES } from "@/lib/auth/roles";

const PASSWORD_MIN_LENGTH = 12;

const email = z
  .string({ error: "Enter an e-mail address." })
  .trim()
  .max(254, "That e-mail address is too long.")
  .pipe(z.email({ error: "Enter a valid e-mail address, like name@example.org." }));

const newPassword = z
  .string({ error: "Choose a password." })
  .min(PASSWORD_MIN_LENGTH, `Use at least ${PASSWORD_MIN_LENGTH} characters.`)
  .max(200, "Use at most 200 characters.");

export const signInSchema = z.object({
  email,
  password: z.string({ error: "Enter your password." }).max(200, "That password is too long."),
  next: z.string().optional(),
});

export const inviteUserSchema = z.object({
  email,
  name: z.string({ error: "Enter the person's name." }).trim().min(1, "Enter the person's name.").max(120),
  role: z.enum(ROLES, { error: "Choose a role." }),
  /** "sso": the person signs in through the institution (no password link). */
  signInMethod: z
    .enum(["password", "sso"], { error: "Choose how the person signs in: with a password or with their institution." })
    .optional()
    .transform((v) => v ?? "password"),
});

export const changeRoleSchema = z.object({
  userId: z.coerce.number().int().positive(),
  role: z.enum(ROLES, { error: "Choose a role." }),
});

export const setActiveSchema = z.object({
  userId: z.coerce.number().int().positive(),
  active: z.enum(["true", "false"]).transform((v) => v === "true"),
});

export const setPasswordSchema = z
  .object({
    token: z.string().min(1).max(200),
    name: z.string().trim().min(1, "Enter your name.").max(120).optional(),
    password: newPassword,
    confirmPassword: z.string({ error: "Repeat the password." }),
  })
  .refine((value) => value.password === value.confirmPassword, {
    path: ["confirmPassword"],
    message: "The two passwords differ.",
  });

export const requestResetSchema = z.object({ email });

const alertDelivery = (label: string) =>
  z.enum(["immediate", "digest", "off"], { error: `${label}: choose as they happen, in the daily digest, or off.` });

/** Which alerts a person receives and how. "off" removes a kind from the digest too. */
export const alertPreferencesSchema = z.object({
  alertExcursions: alertDelivery("Excursion alerts"),
  alertFindings: alertDelivery("Finding alerts"),
  dailyDigest: z
    .union([z.boolean(), z.enum(["true", "false"])], { error: "Daily digest: choose yes or no." })
    .transform((v) => v === true || v === "true"),
});
export type AlertPreferencesInput = z.output<typeof alertPreferencesSchema>;

export const endSessionSchema = z.object({ sessionId: z.coerce.number().int().positive() });

export const signOutElsewhereSchema = z.object({});

export const endUserSessionsSchema = z.object({ userId: z.coerce.number().int().positive() });

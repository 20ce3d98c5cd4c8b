import "server-only";
import type { z } from "zod";
import { ForbiddenError, UnauthenticatedError, ValidationError, type FieldErrors } from "@/lib/errors";
import { scopeFor, type Action, type Scope } from "./permissions";
import type { SessionUser } from "./session";

export type Authorized<T> = { user: SessionUser; scope: Scope; input: T };

/** zod issues as { "field.path": ["message", …] }; "" holds errors about the whole input. */
export function fieldErrorsFrom(error: z.ZodError): FieldErrors {
  const fields: FieldErrors = {};
  for (const issue of error.issues) {
    const key = issue.path.map(String).join(".");
    (fields[key] ??= []).push(issue.message);
  }
  return fields;
}

/**
 * The one check every write (and every protected read) goes through, in this order:
 * signed in → the role allows the action → the input parses. Ownership ("own" scope) is then
 * enforced by the query that reads or writes, inside its transaction.
 */
export function authorize<S extends z.ZodType>(
  user: SessionUser | null,
  action: Action,
  schema: S | undefined,
  raw: unknown,
): Authorized<z.output<S>> {
  const { scope } = authorizeAction(user, action);
  return { user: user!, scope, input: parseInput(schema, raw) };
}

/** The first two steps alone: signed in, then the role allows the action. */
export function authorizeAction(user: SessionUser | null, action: Action): { user: SessionUser; scope: Scope } {
  if (!user) throw new UnauthenticatedError();
  const scope = scopeFor(user.role, action);
  if (!scope) throw new ForbiddenError();
  return { user, scope };
}

export function parseInput<S extends z.ZodType>(schema: S | undefined, raw: unknown): z.output<S> {
  if (!schema) return undefined as z.output<S>;
  const parsed = schema.safeParse(raw);
  if (!parsed.success) throw new ValidationError("Some fields need attention.", fieldErrorsFrom(parsed.error));
  return parsed.data;
}

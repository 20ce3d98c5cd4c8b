import "server-only";
import { parseWithZod } from "@conform-to/zod/v4";
import type { SubmissionResult } from "@conform-to/react";
import type { z } from "zod";
import { DomainError } from "@/lib/errors";
import { withClearedFields } from "@/lib/validation/cleared-fields";
import { log } from "@/lib/log";
import { workerWritesDone } from "@/lib/workers/write-gate";
import { authorizeAction } from "./guard";
import type { Action, Scope } from "./permissions";
import { getSessionUser, type SessionUser } from "./session";

export type FormState = SubmissionResult<string[]> & { message?: string };

type Ctx<T> = { user: SessionUser; scope: Scope; input: T };

/**
 * A server action for a Conform form: signed in → role allows → the shared zod schema parses.
 * A domain error comes back to the form as a message (under its field where it names one), and
 * the form keeps what the user typed. Returning a string shows it as a success message.
 */
export function formAction<S extends z.ZodType>(
  /** `emptiedClears`: an edit form that sends every field it shows; an optional field sent empty is cleared (null), not left unchanged. */
  spec: { action: Action | "public"; schema: S; emptiedClears?: boolean },
  handler: (ctx: Ctx<z.output<S>>) => Promise<string | void>,
) {
  return async (previous: FormState | FormData | undefined, formData?: FormData): Promise<FormState> => {
    // Bound straight to a form's action (no useActionState), the action gets the form data first.
    if (formData === undefined && previous instanceof FormData) formData = previous;
    if (!(formData instanceof FormData)) {
      return { status: "error", error: { "": ["The form could not be read. Reload the page and try again."] } };
    }
    const submission = parseWithZod(formData, { schema: spec.schema });
    try {
      let user: SessionUser | null = null;
      let scope: Scope = "all";
      if (spec.action !== "public") {
        ({ user, scope } = authorizeAction(await getSessionUser(), spec.action));
      }
      if (submission.status !== "success") return submission.reply();
      // Wait (without blocking other requests) while a worker is inside a long write.
      await workerWritesDone();
      const input = spec.emptiedClears ? withClearedFields(spec.schema, formData, submission.value) : submission.value;
      const message = await handler({ user: user!, scope, input: input as z.output<S> });
      log.info({ action: spec.action, userId: user?.id, outcome: "ok" }, "server action");
      return { ...submission.reply({ resetForm: false }), message: message ?? undefined };
    } catch (error) {
      if (error instanceof DomainError) {
        log.info({ action: spec.action, outcome: error.code }, "server action");
        return submission.reply({ formErrors: [error.message], fieldErrors: error.fields });
      }
      throw error; // redirects and real failures
    }
  };
}

"use client";
import { useForm } from "@conform-to/react";
import { parseWithZod } from "@conform-to/zod/v4";
import { startTransition, useActionState } from "react";
import type { z } from "zod";
import type { FormState } from "@/lib/auth/form-action";

type ServerAction = (previous: FormState | undefined, formData: FormData) => Promise<FormState>;

/**
 * Conform + a server action with one shared zod schema. The submit is sent in a transition so
 * React does not reset the form after the action: what the user typed stays after an error.
 */
export function useServerForm<S extends z.ZodObject>(
  schema: S,
  action: ServerAction,
  options: { id?: string; defaultValue?: Record<string, unknown> } = {},
) {
  const [lastResult, dispatch, pending] = useActionState(action, undefined);
  const [form, fields] = useForm<z.input<S>, z.output<S>>({
    id: options.id,
    lastResult,
    defaultValue: options.defaultValue as never,
    // Errors appear on the first submit (no layout jumps while moving between fields), then follow typing.
    shouldValidate: "onSubmit",
    shouldRevalidate: "onInput",
    onValidate({ formData }) {
      return parseWithZod(formData, { schema });
    },
    onSubmit(event, { formData }) {
      event.preventDefault();
      startTransition(() => dispatch(formData));
    },
  });
  return { form, fields, dispatch, pending, lastResult };
}

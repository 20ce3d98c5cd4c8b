"use client";
import { getFormProps } from "@conform-to/react";
import Link from "next/link";
import { TextField } from "@/components/forms/text-field";
import { useServerForm } from "@/components/forms/use-server-form";
import { Button } from "@/components/ui/button";
import { FormMessage } from "@/components/ui/form-message";
import { signInSchema } from "@/lib/users/schemas";
import { signInAction } from "../actions";

export function SignInForm({ next }: { next?: string }) {
  const { form, fields, pending, dispatch } = useServerForm(signInSchema, signInAction, { id: "sign-in" });
  return (
    <form {...getFormProps(form)} action={dispatch} className="space-y-5" noValidate>
      <FormMessage id={form.errorId} errors={form.errors} />
      <input type="hidden" name="next" value={next ?? ""} />
      <TextField field={fields.email} label="E-mail address" type="email" autoComplete="username" autoFocus />
      <TextField field={fields.password} label="Password" type="password" autoComplete="current-password" />
      <Button type="submit" className="w-full" disabled={pending}>
        {pending ? "Signing in…" : "Sign in"}
      </Button>
      <p className="text-center text-sm">
        <Link href="/reset-password" className="text-accent-700 underline-offset-2 hover:underline">
          Forgot your password?
        </Link>
      </p>
    </form>
  );
}

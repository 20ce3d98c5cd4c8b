"use client";
import { useActionState } from "react";
import { Button } from "@/components/ui/button";
import { FormMessage } from "@/components/ui/form-message";
import type { FormState } from "@/lib/auth/form-action";
import { setStateAction } from "../actions";

function messages(state: FormState | undefined) {
  const errors = state?.error ? Object.values(state.error).flat().filter((m): m is string => Boolean(m)) : undefined;
  return { errors: errors?.length ? errors : undefined, success: state?.status === "success" ? state.message : undefined };
}

const STATES: { state: string; label: string }[] = [
  { state: "opened", label: "Mark opened" },
  { state: "in_use", label: "Mark in use" },
  { state: "empty", label: "Mark empty" },
  { state: "disposed", label: "Mark disposed of" },
];

export function ContainerStateButtons({ id, current }: { id: number; current: string }) {
  const [state, dispatch, pending] = useActionState(setStateAction, undefined);
  return (
    <div className="space-y-2">
      <FormMessage {...messages(state)} />
      <div className="flex flex-wrap gap-2">
        {STATES.filter((s) => s.state !== current).map((s) => (
          <form key={s.state} action={dispatch}>
            <input type="hidden" name="id" value={id} />
            <input type="hidden" name="state" value={s.state} />
            <Button
              type="submit"
              size="sm"
              variant={s.state === "disposed" ? "danger" : "secondary"}
              disabled={pending}
              onClick={(event) => {
                if (s.state === "disposed" && !window.confirm("Mark this container disposed of? Its record is kept but can no longer be changed.")) event.preventDefault();
              }}
            >
              {s.label}
            </Button>
          </form>
        ))}
      </div>
    </div>
  );
}

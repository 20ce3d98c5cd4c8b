"use client";
import { useActionState } from "react";
import { Button } from "@/components/ui/button";
import { inputClass } from "@/components/ui/field";
import { FormMessage } from "@/components/ui/form-message";
import type { FormState } from "@/lib/auth/form-action";
import { moveContainerAction, setStateAction } from "../actions";

type UnitOption = { id: number; code: string; name: string; roomCode: string; siteName: string };

function messages(state: FormState | undefined) {
  const errors = state?.error ? Object.values(state.error).flat().filter((m): m is string => Boolean(m)) : undefined;
  return { errors: errors?.length ? errors : undefined, success: state?.status === "success" ? state.message : undefined };
}

export function MoveContainer({ id, currentUnitId, units }: { id: number; currentUnitId: number; units: UnitOption[] }) {
  const [state, dispatch, pending] = useActionState(moveContainerAction, undefined);
  return (
    <form action={dispatch} className="space-y-2">
      <FormMessage {...messages(state)} />
      <input type="hidden" name="id" value={id} />
      <label htmlFor="move-to" className="block text-sm font-medium text-ink-800">
        Move to
      </label>
      <div className="flex gap-2">
        <select id="move-to" name="storageUnitId" defaultValue="" className={inputClass}>
          <option value="" disabled>
            Choose a storage unit
          </option>
          {units
            .filter((u) => u.id !== currentUnitId)
            .map((u) => (
              <option key={u.id} value={u.id}>
                {u.siteName} · {u.roomCode} / {u.code} {u.name}
              </option>
            ))}
        </select>
        <Button type="submit" variant="secondary" disabled={pending}>
          Move
        </Button>
      </div>
    </form>
  );
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

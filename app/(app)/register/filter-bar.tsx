"use client";
import { Search } from "lucide-react";
import { usePathname, useRouter, useSearchParams } from "next/navigation";
import { useCallback, useEffect, useId, useState, type FormEvent } from "react";
import { controlClass, SEARCH_DEBOUNCE_MS } from "@/components/data-table/data-table-toolbar";

type Option = { value: string; label: string };
export type LocationGroup = { room: Option; units: Option[] };

/**
 * The register's filters for the lines and by-location views: search (finding words, room and unit
 * codes), a location picker (a room includes its units), severity, status, rule and "only my
 * containers". Each change rewrites the URL; the page reads it on the server.
 */
export function RegisterFilterBar({ locations, rules, showMine }: { locations: LocationGroup[]; rules: Option[]; showMine: boolean }) {
  const router = useRouter();
  const pathname = usePathname();
  const params = useSearchParams();
  const id = useId();
  const [text, setText] = useState(params.get("q") ?? "");
  const location = params.get("storageUnitId") ? `unit:${params.get("storageUnitId")}` : params.get("roomId") ? `room:${params.get("roomId")}` : "";

  const current = params.toString();
  const apply = useCallback(
    (changes: Record<string, string | null>) => {
      const next = new URLSearchParams(current);
      for (const [key, value] of Object.entries(changes)) {
        if (value === null || value === "") next.delete(key);
        else next.set(key, value);
      }
      next.delete("page");
      router.replace(`${pathname}?${next.toString()}`, { scroll: false });
    },
    [current, pathname, router],
  );

  // Typing is applied after a short pause, as in every table's search box; Enter applies at once.
  const applied = params.get("q") ?? "";
  const [seen, setSeen] = useState(applied);
  const [sent, setSent] = useState(applied);
  // The URL changed under us (back button, another link): show its value, unless it is only the
  // echo of what this box sent while the user kept typing.
  if (applied !== seen) {
    setSeen(applied);
    if (applied !== sent) setText(applied);
  }
  useEffect(() => {
    const wanted = text.trim();
    if (wanted === applied) return;
    const timer = setTimeout(() => {
      setSent(wanted);
      apply({ q: wanted });
    }, SEARCH_DEBOUNCE_MS);
    return () => clearTimeout(timer);
  }, [text, applied, apply]);

  function submit(event: FormEvent) {
    event.preventDefault();
    setSent(text.trim());
    apply({ q: text.trim() });
  }

  const select = (param: string, label: string, allLabel: string, options: Option[]) => (
    <div className="flex flex-col gap-1">
      <label htmlFor={`${id}-${param}`} className="text-xs font-medium text-ink-700">
        {label}
      </label>
      <select id={`${id}-${param}`} value={params.get(param) ?? ""} onChange={(event) => apply({ [param]: event.target.value })} className={`${controlClass} pr-8`}>
        <option value="">{allLabel}</option>
        {options.map((o) => (
          <option key={o.value} value={o.value}>
            {o.label}
          </option>
        ))}
      </select>
    </div>
  );

  return (
    <div className="flex flex-wrap items-end gap-3 rounded-lg border border-ink-200 bg-white px-3 py-3">
      <form role="search" onSubmit={submit} className="flex w-full min-w-0 flex-col gap-1 sm:w-80">
        <label htmlFor={`${id}-q`} className="text-xs font-medium text-ink-700">
          Search
        </label>
        <div className="relative">
          <Search aria-hidden="true" className="pointer-events-none absolute top-1/2 left-2.5 size-4 -translate-y-1/2 text-ink-400" />
          <input
            id={`${id}-q`}
            type="search"
            value={text}
            maxLength={100}
            placeholder="Words, room or unit code (B-014, FR-1)"
            autoComplete="off"
            spellCheck={false}
            onChange={(event) => setText(event.target.value)}
            className={`${controlClass} w-full pl-8`}
          />
        </div>
      </form>
      <div className="flex flex-col gap-1">
        <label htmlFor={`${id}-location`} className="text-xs font-medium text-ink-700">
          Location
        </label>
        <select
          id={`${id}-location`}
          value={location}
          onChange={(event) => {
            const [kind, value] = event.target.value.split(":");
            apply({ roomId: kind === "room" ? value : null, storageUnitId: kind === "unit" ? value : null });
          }}
          className={`${controlClass} max-w-72 pr-8`}
        >
          <option value="">Every location</option>
          {locations.map((group) => (
            <optgroup key={group.room.value} label={group.room.label}>
              <option value={`room:${group.room.value}`}>{group.room.label}, with its units</option>
              {group.units.map((unit) => (
                <option key={unit.value} value={`unit:${unit.value}`}>
                  {unit.label}
                </option>
              ))}
            </optgroup>
          ))}
        </select>
      </div>
      {select("severity", "Severity", "Any severity", [
        { value: "critical,high", label: "Critical or high" },
        { value: "critical", label: "Critical" },
        { value: "high", label: "High" },
        { value: "moderate", label: "Moderate" },
        { value: "low", label: "Low" },
      ])}
      {select("status", "Status", "Default view", [
        { value: "open,acknowledged,mitigating", label: "Needs work" },
        { value: "open", label: "Open" },
        { value: "acknowledged", label: "Acknowledged" },
        { value: "mitigating", label: "Mitigating" },
        { value: "risk_accepted", label: "Risk accepted" },
        { value: "resolved", label: "Resolved" },
        { value: "all", label: "Any status" },
      ])}
      {rules.length ? select("rule", "Rule", "Any rule", rules) : null}
      {showMine ? (
        <label className="flex h-9 items-center gap-2 text-sm text-ink-800">
          <input type="checkbox" checked={params.get("mine") === "true"} onChange={(event) => apply({ mine: event.target.checked ? "true" : null })} className="size-4 accent-accent-700" />
          Only my containers
        </label>
      ) : null}
    </div>
  );
}

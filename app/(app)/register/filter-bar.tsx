"use client";
import { usePathname, useRouter, useSearchParams } from "next/navigation";
import { useCallback, useId } from "react";
import { controlClass, SearchBox } from "@/components/data-table/search-box";
import { FINDING_SEARCH } from "./register-columns";

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

  const onSearch = useCallback((text: string) => apply({ q: text }), [apply]);

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
      <SearchBox value={params.get("q") ?? ""} label={FINDING_SEARCH.label} placeholder={FINDING_SEARCH.placeholder} maxLength={FINDING_SEARCH.maxLength} onSearch={onSearch} />
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

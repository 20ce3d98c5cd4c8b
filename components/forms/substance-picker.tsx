"use client";
import { useEffect, useId, useRef, useState } from "react";
import { describedBy, Field, inputClass } from "@/components/ui/field";

type Hit = { id: number; name: string; cas: string | null; synonyms: string[] };

/**
 * Finds a substance by name, synonym or CAS number through the JSON API and keeps the chosen
 * id in a hidden input named `name`. A combobox: arrow keys move, Enter chooses, Escape closes.
 */
export function SubstancePicker({
  name,
  label,
  errors,
  defaultValue,
  formId,
}: {
  name: string;
  label: string;
  errors?: string[];
  defaultValue?: { id: number; name: string; cas: string | null } | null;
  formId?: string;
}) {
  const id = useId();
  const listId = `${id}-list`;
  const [query, setQuery] = useState(defaultValue ? defaultValue.name : "");
  const [chosen, setChosen] = useState(defaultValue ?? null);
  const [hits, setHits] = useState<Hit[]>([]);
  const [open, setOpen] = useState(false);
  const [active, setActive] = useState(0);
  const abort = useRef<AbortController | null>(null);

  useEffect(() => {
    if (!open || query.trim().length < 2 || (chosen && query === chosen.name)) return;
    const timer = setTimeout(async () => {
      abort.current?.abort();
      const controller = new AbortController();
      abort.current = controller;
      try {
        const response = await fetch(`/api/v1/substances?pageSize=8&q=${encodeURIComponent(query.trim())}`, { signal: controller.signal });
        if (response.ok) {
          const body = (await response.json()) as { data: Hit[] };
          setHits(body.data);
          setActive(0);
        }
      } catch {
        // aborted by a newer query
      }
    }, 200);
    return () => clearTimeout(timer);
  }, [query, open, chosen]);

  const choose = (hit: Hit) => {
    setChosen({ id: hit.id, name: hit.name, cas: hit.cas });
    setQuery(hit.name);
    setOpen(false);
  };

  return (
    <Field id={id} label={label} errors={errors} hint="Type a name, synonym or CAS number.">
      <input type="hidden" name={name} value={chosen?.id ?? ""} form={formId} />
      <div className="relative">
        <input
          id={id}
          type="search"
          role="combobox"
          aria-expanded={open && hits.length > 0}
          aria-controls={listId}
          aria-autocomplete="list"
          aria-activedescendant={open && hits[active] ? `${listId}-${hits[active].id}` : undefined}
          aria-invalid={errors?.length ? true : undefined}
          aria-describedby={describedBy(id, "hint", errors)}
          autoComplete="off"
          className={inputClass}
          value={query}
          onChange={(event) => {
            setQuery(event.target.value);
            setChosen(null);
            setOpen(true);
          }}
          onFocus={() => setOpen(true)}
          onBlur={() => setTimeout(() => setOpen(false), 150)}
          onKeyDown={(event) => {
            if (event.key === "ArrowDown") {
              event.preventDefault();
              setActive((a) => Math.min(a + 1, hits.length - 1));
            } else if (event.key === "ArrowUp") {
              event.preventDefault();
              setActive((a) => Math.max(a - 1, 0));
            } else if (event.key === "Enter" && open && hits[active]) {
              event.preventDefault();
              choose(hits[active]);
            } else if (event.key === "Escape") {
              setOpen(false);
            }
          }}
        />
        {open && hits.length > 0 ? (
          <ul id={listId} role="listbox" className="absolute z-20 mt-1 max-h-72 w-full overflow-auto rounded-md border border-ink-200 bg-white py-1 shadow-lg">
            {hits.map((hit, index) => (
              <li
                key={hit.id}
                id={`${listId}-${hit.id}`}
                role="option"
                aria-selected={index === active}
                className={`cursor-pointer px-3 py-2 text-sm ${index === active ? "bg-accent-50 text-accent-900" : "text-ink-800"}`}
                onMouseDown={(event) => {
                  event.preventDefault();
                  choose(hit);
                }}
              >
                <span className="font-medium">{hit.name}</span>
                <span className="ml-2 font-mono text-xs text-ink-600">{hit.cas ?? "no CAS"}</span>
                {hit.synonyms.length ? <span className="block truncate text-xs text-ink-500">{hit.synonyms.join(", ")}</span> : null}
              </li>
            ))}
          </ul>
        ) : null}
      </div>
      {chosen ? (
        <p className="text-xs text-ok">
          ✓ {chosen.name}
          {chosen.cas ? ` · CAS ${chosen.cas}` : ""}
        </p>
      ) : null}
    </Field>
  );
}

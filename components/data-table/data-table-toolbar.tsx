"use client";

import { useCallback, useId } from "react";
import { controlClass, SearchBox } from "./search-box";
import { SEARCH_PARAM, type DataTableFilters } from "./url-state";

export function DataTableToolbar({
  filters,
  values,
  onChange,
}: {
  filters: DataTableFilters;
  values: Record<string, string>;
  onChange: (param: string, value: string) => void;
}) {
  const baseId = useId();
  const onSearch = useCallback((text: string) => onChange(SEARCH_PARAM, text), [onChange]);
  if (!filters.search && !filters.selects?.length) return null;
  return (
    <div className="flex flex-wrap items-end gap-3 border-b border-ink-200 px-3 py-3">
      {filters.search ? (
        <SearchBox
          value={values[SEARCH_PARAM] ?? ""}
          label={filters.search.label}
          placeholder={filters.search.placeholder}
          maxLength={filters.search.maxLength}
          onSearch={onSearch}
        />
      ) : null}
      {(filters.selects ?? []).map((select) => {
        const id = `${baseId}-${select.param}`;
        return (
          <div key={select.param} className="flex flex-col gap-1">
            <label htmlFor={id} className="text-xs font-medium text-ink-700">
              {select.label}
            </label>
            <select id={id} value={values[select.param] ?? ""} onChange={(event) => onChange(select.param, event.target.value)} className={`${controlClass} pr-8`}>
              <option value="">{select.allLabel ?? "All"}</option>
              {select.options.map((option) => (
                <option key={option.value} value={option.value}>
                  {option.label}
                </option>
              ))}
            </select>
          </div>
        );
      })}
    </div>
  );
}

"use client";

import { Search } from "lucide-react";
import { useEffect, useId, useState, type FormEvent } from "react";
import { SEARCH_MAX_LENGTH, SEARCH_PARAM } from "./url-state";

export const SEARCH_DEBOUNCE_MS = 250;

export const controlClass =
  "h-9 rounded-md border border-ink-300 bg-white px-2.5 text-sm text-ink-900 shadow-xs placeholder:text-ink-400 focus:border-accent-600 focus:outline-none focus:ring-2 focus:ring-accent-200";

/**
 * The search box of every list: typing is applied after a short pause, Enter applies at once.
 * `value` is the search in the URL; `onSearch` is called with the trimmed text to put there.
 */
export function SearchBox({
  value,
  label,
  placeholder,
  maxLength = SEARCH_MAX_LENGTH,
  onSearch,
}: {
  value: string;
  label: string;
  placeholder?: string;
  maxLength?: number;
  onSearch: (text: string) => void;
}) {
  const id = useId();
  const [text, setText] = useState(value);
  const [seen, setSeen] = useState(value);
  const [sent, setSent] = useState(value);
  // The URL changed under us (back button, "clear filters"): show its value, unless it is only
  // the echo of what this box sent while the user kept typing.
  if (value !== seen) {
    setSeen(value);
    if (value !== sent) setText(value);
  }

  useEffect(() => {
    const wanted = text.trim();
    if (wanted === value) return;
    const timer = setTimeout(() => {
      setSent(wanted);
      onSearch(wanted);
    }, SEARCH_DEBOUNCE_MS);
    return () => clearTimeout(timer);
  }, [text, value, onSearch]);

  function submit(event: FormEvent) {
    event.preventDefault();
    const wanted = text.trim();
    if (wanted === value) return;
    setSent(wanted);
    onSearch(wanted);
  }

  return (
    <form role="search" onSubmit={submit} className="flex w-full min-w-0 flex-col gap-1 sm:w-80 sm:flex-none">
      <label htmlFor={id} className="text-xs font-medium text-ink-700">
        {label}
      </label>
      <div className="relative">
        <Search aria-hidden="true" className="pointer-events-none absolute top-1/2 left-2.5 size-4 -translate-y-1/2 text-ink-400" />
        <input
          id={id}
          type="search"
          name={SEARCH_PARAM}
          value={text}
          maxLength={maxLength}
          placeholder={placeholder}
          autoComplete="off"
          spellCheck={false}
          onChange={(event) => setText(event.target.value)}
          className={`${controlClass} w-full pl-8`}
        />
      </div>
    </form>
  );
}

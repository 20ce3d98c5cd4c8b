"use client";
import { CalendarDays } from "lucide-react";
import { useRef, type InputHTMLAttributes } from "react";

/** A date as everywhere else in Headroom: yyyy-mm-dd. */
export const ISO_DATE_PATTERN = "\\d{4}-\\d{2}-\\d{2}";

/**
 * A date field that shows and takes ISO dates (yyyy-mm-dd) whatever the browser's language: a
 * browser's own date input shows the operating system's format (mm/dd/yyyy on many machines),
 * beside ISO dates everywhere else. The calendar button opens the browser's own date picker
 * (a hidden native input) and writes its choice back as yyyy-mm-dd. Without JavaScript it is a
 * plain text field the server checks. Pass the same props as to an <input> (Conform's
 * getInputProps included, whatever type they carry); it is always a text field.
 */
export function DateInput({ className, ...props }: InputHTMLAttributes<HTMLInputElement>) {
  const textRef = useRef<HTMLInputElement>(null);
  const pickerRef = useRef<HTMLInputElement>(null);

  /** Sets the visible field as typing would, so form libraries listening for input see it. */
  const setText = (value: string) => {
    const input = textRef.current;
    if (!input) return;
    const setter = Object.getOwnPropertyDescriptor(HTMLInputElement.prototype, "value")?.set;
    setter?.call(input, value);
    input.dispatchEvent(new Event("input", { bubbles: true }));
    input.dispatchEvent(new Event("change", { bubbles: true }));
  };

  const openPicker = () => {
    const picker = pickerRef.current;
    const text = textRef.current;
    if (!picker || !text) return;
    picker.value = new RegExp(`^${ISO_DATE_PATTERN}$`).test(text.value) ? text.value : "";
    try {
      picker.showPicker();
    } catch {
      text.focus();
    }
  };

  return (
    <div className="relative">
      <input
        {...props}
        ref={textRef}
        type="text"
        inputMode="numeric"
        pattern={ISO_DATE_PATTERN}
        placeholder={props.placeholder ?? "yyyy-mm-dd"}
        autoComplete="off"
        className={`${className ?? ""} pr-10`}
      />
      <input
        ref={pickerRef}
        type="date"
        tabIndex={-1}
        aria-hidden="true"
        className="pointer-events-none absolute bottom-0 left-0 h-0 w-0 opacity-0"
        onChange={(event) => setText(event.currentTarget.value)}
      />
      <button
        type="button"
        onClick={openPicker}
        disabled={props.disabled || props.readOnly}
        aria-label="Choose the date on a calendar"
        className="absolute inset-y-0 right-0 flex w-9 items-center justify-center rounded-r-md text-ink-500 hover:text-ink-800 focus-visible:outline focus-visible:outline-2 focus-visible:outline-offset-[-2px] focus-visible:outline-accent-600 disabled:opacity-40"
      >
        <CalendarDays aria-hidden="true" className="size-4" />
      </button>
    </div>
  );
}

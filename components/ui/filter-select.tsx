// A labelled filter select: an "any" choice first, then the options. Used by the lists' filter bars
// (controlled with value/onChange in client lists, or defaultValue in plain GET forms).
import type { SelectHTMLAttributes } from "react";

export function FilterSelect({
  id,
  label,
  anyLabel,
  options,
  ...select
}: SelectHTMLAttributes<HTMLSelectElement> & {
  id: string;
  label: string;
  /** The first choice, meaning "no filter" (value ""). */
  anyLabel: string;
  options: readonly { value: string; label: string }[];
}) {
  return (
    // max-w-full: a long option (an instrument's name) must not widen a phone's page.
    <div className="flex max-w-full flex-col gap-1">
      <label htmlFor={id} className="text-sm font-medium">
        {label}
      </label>
      <select
        id={id}
        className="max-w-full rounded border border-[var(--line)] bg-[var(--panel)] px-2 py-1.5 text-sm"
        {...select}
      >
        <option value="">{anyLabel}</option>
        {options.map((o) => (
          <option key={o.value} value={o.value}>
            {o.label}
          </option>
        ))}
      </select>
    </div>
  );
}

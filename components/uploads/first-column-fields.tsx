"use client";
// Two selects that say what a file's first column holds and, for wavelengths, air or vacuum: the
// instrument form's export profile and the upload page's question use the same pair. The medium select
// appears only for a wavelength column. Each select points at its error region, which is aria-live.
import type { FirstColumnKind, WavelengthMedium } from "@/lib/spectrum/types";
import { FIRST_COLUMN_LABELS, MEDIUM_LABELS } from "./first-column-labels";
import { isWavelengthUnit } from "@/lib/spectrum/types";

const SELECT = "rounded border border-[var(--line)] bg-[var(--panel)] px-2 py-1.5";
const ERROR = "text-xs text-red-700 dark:text-red-300";

export function FirstColumnFields({
  idPrefix,
  unitName,
  mediumName,
  unitLabel,
  unsetLabel,
  unit,
  medium,
  onUnitChange,
  onMediumChange,
  unitErrors,
  mediumErrors,
  hintId,
}: {
  /** Prefix of the element ids, unique on the page. */
  idPrefix: string;
  /** Form field names, when the selects belong to a form. */
  unitName?: string;
  mediumName?: string;
  unitLabel: string;
  /** The first option, meaning "not said"; omitted, the select starts with a prompt to choose. */
  unsetLabel?: string;
  unit: FirstColumnKind | "";
  medium: WavelengthMedium | "";
  onUnitChange: (unit: FirstColumnKind | "") => void;
  onMediumChange: (medium: WavelengthMedium | "") => void;
  unitErrors?: string[];
  mediumErrors?: string[];
  /** An element that explains the selects (read with them by screen readers). */
  hintId?: string;
}) {
  const unitId = `${idPrefix}-x-unit`;
  const mediumId = `${idPrefix}-medium`;
  const describe = (errorId: string) => [errorId, hintId].filter(Boolean).join(" ");
  return (
    <div className="grid grid-cols-1 gap-3 sm:grid-cols-2">
      <div className="flex flex-col gap-1">
        <label htmlFor={unitId} className="text-sm font-medium">
          {unitLabel}
        </label>
        <select
          id={unitId}
          name={unitName}
          value={unit}
          onChange={(event) => onUnitChange(event.target.value as FirstColumnKind | "")}
          aria-describedby={describe(`${unitId}-error`)}
          aria-invalid={unitErrors?.length ? true : undefined}
          className={SELECT}
        >
          <option value="">{unsetLabel ?? "Choose…"}</option>
          {(Object.keys(FIRST_COLUMN_LABELS) as FirstColumnKind[]).map((value) => (
            <option key={value} value={value}>
              {FIRST_COLUMN_LABELS[value]}
            </option>
          ))}
        </select>
        <div id={`${unitId}-error`} aria-live="polite" className={ERROR}>
          {unitErrors?.join(" ")}
        </div>
      </div>
      {isWavelengthUnit(unit) ? (
        <div className="flex flex-col gap-1">
          <label htmlFor={mediumId} className="text-sm font-medium">
            Wavelengths measured
          </label>
          <select
            id={mediumId}
            name={mediumName}
            value={medium}
            onChange={(event) => onMediumChange(event.target.value as WavelengthMedium | "")}
            aria-describedby={describe(`${mediumId}-error`)}
            aria-invalid={mediumErrors?.length ? true : undefined}
            className={SELECT}
          >
            <option value="">Not known</option>
            {(Object.keys(MEDIUM_LABELS) as WavelengthMedium[]).map((value) => (
              <option key={value} value={value}>
                {MEDIUM_LABELS[value]}
              </option>
            ))}
          </select>
          <div id={`${mediumId}-error`} aria-live="polite" className={ERROR}>
            {mediumErrors?.join(" ")}
          </div>
        </div>
      ) : null}
    </div>
  );
}

"use client";
// The lab lead's form that adds a spectrometer to the team (dispersion, pixels, nominal range, resolution,
// and for a prism its glass and apex angle when they are known) or, given an instrument, edits it. Once an
// instrument has calibrations its dispersion and pixel count are shown but fixed (sent as hidden fields).
// Its export profile (what the first column of its files holds, air or vacuum) may always change.
import { useActionState, useState } from "react";
import { Button } from "@/components/ui/button";
import { Field } from "@/components/ui/field";
import { FormMessage } from "@/components/ui/form-message";
import type { InstrumentRecord } from "@/lib/services/instrument-types";
import type { FirstColumnKind, WavelengthMedium } from "@/lib/spectrum/types";
import { initialFormState, type FormState } from "@/lib/validation/form-state";
import { FirstColumnFields } from "@/components/uploads/first-column-fields";

/** The stored instrument an edit starts from. */
export interface InstrumentFormInitial extends Pick<
  InstrumentRecord,
  | "id"
  | "version"
  | "name"
  | "dispersion"
  | "pixels"
  | "nominalMinNm"
  | "nominalMaxNm"
  | "resolutionNm"
  | "detectorMax"
  | "glass"
  | "apexDeg"
  | "exportXUnit"
  | "exportMedium"
> {
  /** Whether calibrations were made on it: then the dispersion and pixel count are fixed. */
  calibrated: boolean;
}

const LOCKED_INPUT =
  "rounded border border-[var(--line)] bg-ink-100 px-2 py-1.5 text-base opacity-60 dark:bg-ink-800";

const text = (value: number | string | null) => (value === null ? "" : String(value));

function initialValues(initial: InstrumentFormInitial | undefined): Record<string, string> {
  if (!initial) return {};
  return {
    name: initial.name,
    dispersion: initial.dispersion,
    pixels: text(initial.pixels),
    nominalMinNm: text(initial.nominalMinNm),
    nominalMaxNm: text(initial.nominalMaxNm),
    resolutionNm: text(initial.resolutionNm),
    detectorMax: text(initial.detectorMax),
    glass: text(initial.glass),
    apexDeg: text(initial.apexDeg),
    exportXUnit: text(initial.exportXUnit),
    exportMedium: text(initial.exportMedium),
  };
}

export function InstrumentForm({
  teamId,
  glassNames,
  action,
  initial,
}: {
  teamId: string;
  glassNames: readonly string[];
  action: (state: FormState, formData: FormData) => Promise<FormState>;
  /** Given: the form edits this instrument; absent: it adds a new one. */
  initial?: InstrumentFormInitial;
}) {
  const [state, formAction, pending] = useActionState(action, initialFormState);
  const v = state.values ?? initialValues(initial);
  const [dispersion, setDispersion] = useState(v.dispersion ?? "grating");
  const [exportXUnit, setExportXUnit] = useState((v.exportXUnit ?? "") as FirstColumnKind | "");
  const [exportMedium, setExportMedium] = useState((v.exportMedium ?? "") as WavelengthMedium | "");
  const e = state.fieldErrors ?? {};
  const editing = initial !== undefined;
  const locked = initial?.calibrated ?? false;
  const headingId = editing ? "edit-instrument" : "new-instrument";
  return (
    <form
      action={formAction}
      className="panel flex flex-col gap-3 p-4"
      noValidate
      aria-labelledby={headingId}
    >
      <h2 id={headingId} className="text-lg font-semibold">
        {editing ? "Edit the instrument" : "Add an instrument"}
      </h2>
      <input type="hidden" name="teamId" value={teamId} />
      {initial ? (
        <>
          <input type="hidden" name="instrumentId" value={initial.id} />
          <input type="hidden" name="version" value={initial.version} />
        </>
      ) : null}
      {locked ? (
        <p
          id="geometry-locked"
          className="rounded border border-[var(--line)] bg-ink-100 px-3 py-2 text-sm dark:bg-ink-800"
        >
          This instrument has calibrations, so its dispersion and pixel count are fixed: the
          calibrations and the runs on them were made on that geometry. For a different array or
          dispersion, add a new instrument.
        </p>
      ) : null}
      <div className="grid grid-cols-1 gap-3 sm:grid-cols-2">
        <Field label="Name" name="name" defaultValue={v.name} errors={e.name} required />
        <div className="flex flex-col gap-1">
          <label htmlFor="dispersion" className="text-sm font-medium">
            Dispersion
          </label>
          {locked ? <input type="hidden" name="dispersion" value={dispersion} /> : null}
          <select
            id="dispersion"
            name={locked ? undefined : "dispersion"}
            value={dispersion}
            disabled={locked}
            onChange={(event) => setDispersion(event.target.value)}
            aria-describedby={locked ? "dispersion-error geometry-locked" : "dispersion-error"}
            className="rounded border border-[var(--line)] bg-[var(--panel)] px-2 py-1.5 disabled:opacity-60"
          >
            <option value="grating">Grating (close to linear in pixel)</option>
            <option value="prism">Prism (strongly non-linear)</option>
          </select>
          <div
            id="dispersion-error"
            aria-live="polite"
            className="text-xs text-red-700 dark:text-red-300"
          >
            {e.dispersion?.join(" ")}
          </div>
        </div>
        <Field
          label="Pixels"
          name="pixels"
          inputMode="numeric"
          defaultValue={v.pixels ?? "2048"}
          errors={e.pixels}
          hint={locked ? "Fixed: the instrument has calibrations." : undefined}
          {...(locked ? { readOnly: true, className: LOCKED_INPUT } : {})}
        />
        <Field
          label="Resolution, FWHM (nm)"
          name="resolutionNm"
          inputMode="decimal"
          defaultValue={v.resolutionNm}
          errors={e.resolutionNm}
        />
        <Field
          label="Nominal range from (nm)"
          name="nominalMinNm"
          inputMode="decimal"
          defaultValue={v.nominalMinNm}
          errors={e.nominalMinNm}
        />
        <Field
          label="Nominal range to (nm)"
          name="nominalMaxNm"
          inputMode="decimal"
          defaultValue={v.nominalMaxNm}
          errors={e.nominalMaxNm}
        />
        <Field
          label="Detector maximum (counts, optional)"
          name="detectorMax"
          inputMode="numeric"
          defaultValue={v.detectorMax}
          errors={e.detectorMax}
          hint="Peaks at this level are flagged as saturated."
        />
        {dispersion === "prism" ? (
          <>
            <div className="flex flex-col gap-1">
              <label htmlFor="glass" className="text-sm font-medium">
                Prism glass (optional)
              </label>
              <select
                id="glass"
                name="glass"
                defaultValue={v.glass ?? ""}
                aria-describedby="glass-error"
                className="rounded border border-[var(--line)] bg-[var(--panel)] px-2 py-1.5"
              >
                <option value="">Not known: the calibration finds it</option>
                {glassNames.map((g) => (
                  <option key={g} value={g}>
                    {g}
                  </option>
                ))}
              </select>
              <div
                id="glass-error"
                aria-live="polite"
                className="text-xs text-red-700 dark:text-red-300"
              >
                {e.glass?.join(" ")}
              </div>
            </div>
            <Field
              label="Apex angle (°, optional)"
              name="apexDeg"
              inputMode="decimal"
              defaultValue={v.apexDeg}
              errors={e.apexDeg}
            />
          </>
        ) : null}
      </div>
      <fieldset className="flex flex-col gap-2 border-t border-[var(--line)] pt-3">
        <legend className="text-sm font-semibold">Export profile</legend>
        <p id="export-profile-hint" className="muted max-w-prose text-xs">
          How this instrument&apos;s files are read when they do not say what their first column
          holds (no header). Pixel indices counted from 0 or from 1 matter: the calibration maps the
          index to a wavelength. Left unset, the first upload whose header or uploader says it sets
          it.
        </p>
        <FirstColumnFields
          idPrefix="export"
          unitName="exportXUnit"
          mediumName="exportMedium"
          unitLabel="First column of its files"
          unsetLabel="Not set: ask when a file does not say"
          unit={exportXUnit}
          medium={exportMedium}
          onUnitChange={setExportXUnit}
          onMediumChange={setExportMedium}
          unitErrors={e.exportXUnit}
          mediumErrors={e.exportMedium}
          hintId="export-profile-hint"
        />
      </fieldset>
      <FormMessage message={state.message} />
      <div>
        <Button type="submit" pending={pending}>
          {editing ? "Save changes" : "Add the instrument"}
        </Button>
      </div>
    </form>
  );
}

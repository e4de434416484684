"use client";
// The lab lead's form that adds a spectrometer to the team: dispersion, pixels, nominal range,
// resolution, and for a prism its glass and apex angle when they are known.
import { useActionState, useState } from "react";
import { Button } from "@/components/ui/button";
import { Field } from "@/components/ui/field";
import { FormMessage } from "@/components/ui/form-message";
import { initialFormState, type FormState } from "@/lib/validation/form-state";

export function InstrumentForm({
  teamId,
  glassNames,
  action,
}: {
  teamId: string;
  glassNames: readonly string[];
  action: (state: FormState, formData: FormData) => Promise<FormState>;
}) {
  const [state, formAction, pending] = useActionState(action, initialFormState);
  const [dispersion, setDispersion] = useState(state.values?.dispersion ?? "grating");
  const v = state.values ?? {};
  const e = state.fieldErrors ?? {};
  return (
    <form action={formAction} className="panel flex flex-col gap-3 p-4" noValidate aria-labelledby="new-instrument">
      <h2 id="new-instrument" className="text-lg font-semibold">
        Add an instrument
      </h2>
      <input type="hidden" name="teamId" value={teamId} />
      <div className="grid gap-3 sm:grid-cols-2">
        <Field label="Name" name="name" defaultValue={v.name} errors={e.name} required />
        <div className="flex flex-col gap-1">
          <label htmlFor="dispersion" className="text-sm font-medium">
            Dispersion
          </label>
          <select
            id="dispersion"
            name="dispersion"
            value={dispersion}
            onChange={(event) => setDispersion(event.target.value)}
            aria-describedby="dispersion-error"
            className="rounded border border-[var(--line)] bg-[var(--panel)] px-2 py-1.5"
          >
            <option value="grating">Grating (close to linear in pixel)</option>
            <option value="prism">Prism (strongly non-linear)</option>
          </select>
          <div id="dispersion-error" aria-live="polite" className="text-xs text-red-700 dark:text-red-300">
            {e.dispersion?.join(" ")}
          </div>
        </div>
        <Field label="Pixels" name="pixels" inputMode="numeric" defaultValue={v.pixels ?? "2048"} errors={e.pixels} />
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
              <div id="glass-error" aria-live="polite" className="text-xs text-red-700 dark:text-red-300">
                {e.glass?.join(" ")}
              </div>
            </div>
            <Field label="Apex angle (°, optional)" name="apexDeg" inputMode="decimal" defaultValue={v.apexDeg} errors={e.apexDeg} />
          </>
        ) : null}
      </div>
      <FormMessage message={state.message} />
      <div>
        <Button type="submit" pending={pending}>
          Add the instrument
        </Button>
      </div>
    </form>
  );
}

"use client";
// Starts a run: the sample chosen after its upload, its calibration (the instrument's newest by
// default), the kind of source and optional analysis settings. A flame run shows the cautions first.
import { useActionState, useState } from "react";
import { Button } from "@/components/ui/button";
import { Field } from "@/components/ui/field";
import { FormMessage } from "@/components/ui/form-message";
import { initialFormState, type FormState } from "@/lib/validation/form-state";
import { FlameCautions } from "./run-notices";

export interface CalibrationChoice {
  id: string;
  label: string;
}

const SOURCES = [
  { value: "flame", label: "Flame" },
  { value: "arc", label: "Arc" },
  { value: "spark", label: "Spark" },
  { value: "plasma", label: "Plasma" },
  { value: "lamp", label: "Lamp" },
];

export function RunForm({
  notebookId,
  spectrumId,
  calibrations,
  allowOwnAxis,
  action,
}: {
  notebookId: string;
  spectrumId: string;
  /** Newest first; the first is the default. */
  calibrations: CalibrationChoice[];
  /** The file carries its own wavelength axis, so it may run without a calibration (not lamp-checked). */
  allowOwnAxis: boolean;
  action: (state: FormState, formData: FormData) => Promise<FormState>;
}) {
  const [state, formAction, pending] = useActionState(action, initialFormState);
  const [source, setSource] = useState(state.values?.source ?? "flame");
  const e = state.fieldErrors ?? {};
  return (
    <form action={formAction} className="panel flex max-w-3xl flex-col gap-4 p-4" noValidate aria-labelledby="new-run">
      <h2 id="new-run" className="text-lg font-semibold">
        New run
      </h2>
      <input type="hidden" name="notebookId" value={notebookId} />
      <input type="hidden" name="spectrumId" value={spectrumId} />
      <div className="grid gap-3 sm:grid-cols-2">
        <div className="flex flex-col gap-1">
          <label htmlFor="calibrationId" className="text-sm font-medium">
            Calibration
          </label>
          <select
            id="calibrationId"
            name="calibrationId"
            defaultValue={calibrations[0]?.id ?? ""}
            aria-describedby="calibrationId-error"
            className="rounded border border-[var(--line)] bg-[var(--panel)] px-2 py-1.5"
          >
            {calibrations.map((c, i) => (
              <option key={c.id} value={c.id}>
                {c.label}
                {i === 0 ? " (newest)" : ""}
              </option>
            ))}
            {allowOwnAxis ? <option value="">None: the file&apos;s own wavelength axis (not lamp-checked)</option> : null}
          </select>
          <div id="calibrationId-error" aria-live="polite" className="text-xs text-red-700 dark:text-red-300">
            {e.calibrationId?.join(" ")}
          </div>
        </div>
        <div className="flex flex-col gap-1">
          <label htmlFor="source" className="text-sm font-medium">
            Kind of source
          </label>
          <select
            id="source"
            name="source"
            value={source}
            onChange={(event) => setSource(event.target.value)}
            aria-describedby="source-error"
            className="rounded border border-[var(--line)] bg-[var(--panel)] px-2 py-1.5"
          >
            {SOURCES.map((s) => (
              <option key={s.value} value={s.value}>
                {s.label}
              </option>
            ))}
          </select>
          <div id="source-error" aria-live="polite" className="text-xs text-red-700 dark:text-red-300">
            {e.source?.join(" ")}
          </div>
        </div>
      </div>
      {source === "flame" ? <FlameCautions /> : null}
      <details>
        <summary className="cursor-pointer text-sm font-medium">Analysis settings (optional; blank keeps the defaults)</summary>
        <div className="mt-3 grid gap-3 sm:grid-cols-3">
          <Field label="Minimum SNR of a peak" name="minSnr" inputMode="decimal" defaultValue={state.values?.minSnr} errors={e["settings.minSnr"]} />
          <Field label="Match tolerance k (σ)" name="k" inputMode="decimal" defaultValue={state.values?.k} errors={e["settings.k"]} />
          <Field
            label="Excitation temperature (K)"
            name="temperatureK"
            inputMode="decimal"
            defaultValue={state.values?.temperatureK}
            errors={e["settings.temperatureK"]}
            hint="Expected intensities follow LTE at this temperature where the table has g, A and upper energies."
          />
        </div>
      </details>
      <FormMessage message={state.message ?? e.spectrumId?.join(" ")} />
      <div>
        <Button type="submit" pending={pending}>
          {pending ? "Analysing…" : "Start the run"}
        </Button>
      </div>
    </form>
  );
}

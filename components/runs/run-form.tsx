"use client";
// Starts a run: a sample spectrum picked from the instrument's uploads (fetched with SWR from
// GET /api/spectra; the one just uploaded preselected), its calibration (the instrument's newest by
// default, from GET /api/instruments/:id), the kind of source and optional analysis settings. A flame
// run shows the cautions first.
import Link from "next/link";
import { useActionState, useState } from "react";
import useSWR, { SWRConfig } from "swr";
import { fetchJson } from "@/components/notebooks/fetch-json";
import { spectraKey } from "@/components/notebooks/list-keys";
import { Button } from "@/components/ui/button";
import { Field } from "@/components/ui/field";
import { FormMessage } from "@/components/ui/form-message";
import type { SpectrumSummary } from "@/lib/services/spectra";
import type { CalibrationRecord } from "@/lib/calibrations/types";
import { initialFormState, type FormState } from "@/lib/validation/form-state";
import { FlameCautions } from "./run-notices";
import { SETTING_PLACEHOLDERS } from "@/components/runs/analysis-settings";
import { PendingStatus } from "@/components/ui/pending-status";
import { SAMPLE_ANALYSIS_DEFAULTS } from "@/lib/spectrum/analysis/sample-analysis-defaults";

/** What GET /api/instruments/:id answers, as far as the form needs it. */
export interface InstrumentWithCalibrations {
  id: string;
  calibrations: Pick<CalibrationRecord, "id" | "calibratedOn" | "model" | "rmsNm">[];
}

const selectClass = "rounded border border-[var(--line)] bg-[var(--panel)] px-2 py-1.5";

function calibrationLabel(c: InstrumentWithCalibrations["calibrations"][number]): string {
  return `${c.calibratedOn} · ${c.model} · RMS ${c.rmsNm.toFixed(3)} nm`;
}

function spectrumLabel(s: SpectrumSummary): string {
  const name = s.label && s.label !== s.fileName ? `${s.label} (${s.fileName})` : s.fileName;
  return `${name} · ${s.uploadedAt.slice(0, 16).replace("T", " ")} · ${s.xUnit} axis`;
}

const SOURCES = [
  { value: "flame", label: "Flame" },
  { value: "arc", label: "Arc" },
  { value: "spark", label: "Spark" },
  { value: "plasma", label: "Plasma" },
  { value: "lamp", label: "Lamp" },
];

export function RunForm(props: {
  notebookId: string;
  teamId: string;
  instruments: { id: string; name: string }[];
  /** The instrument and sample to preselect (e.g. the sample just uploaded). */
  initialInstrumentId: string;
  initialSpectrumId?: string;
  /** SWR fallback: the server's answers for the preselected instrument's samples and calibrations. */
  fallback: Record<string, unknown>;
  action: (state: FormState, formData: FormData) => Promise<FormState>;
}) {
  return (
    <SWRConfig value={{ fallback: props.fallback }}>
      <RunFormFields {...props} />
    </SWRConfig>
  );
}

function RunFormFields({
  notebookId,
  teamId,
  instruments,
  initialInstrumentId,
  initialSpectrumId,
  action,
}: {
  notebookId: string;
  teamId: string;
  instruments: { id: string; name: string }[];
  initialInstrumentId: string;
  initialSpectrumId?: string;
  action: (state: FormState, formData: FormData) => Promise<FormState>;
}) {
  const [state, formAction, pending] = useActionState(action, initialFormState);
  const [source, setSource] = useState(state.values?.source ?? "flame");
  const [instrumentId, setInstrumentId] = useState(initialInstrumentId);
  const [chosenSpectrumId, setSpectrumId] = useState(
    state.values?.spectrumId ?? initialSpectrumId ?? "",
  );
  const spectra = useSWR<SpectrumSummary[]>(
    instrumentId ? spectraKey(teamId, instrumentId, "sample") : null,
    fetchJson,
  );
  const instrument = useSWR<InstrumentWithCalibrations>(
    instrumentId ? `/api/instruments/${instrumentId}` : null,
    fetchJson,
  );
  const samples = spectra.data ?? [];
  const sample = samples.find((s) => s.id === chosenSpectrumId) ?? samples[0];
  const calibrations = instrument.data?.calibrations ?? [];
  const allowOwnAxis = sample ? sample.xUnit !== "pixel" : false;
  const needsCalibration =
    sample?.xUnit === "pixel" && instrument.data !== undefined && calibrations.length === 0;
  const loading =
    (spectra.isLoading && !spectra.data) || (instrument.isLoading && !instrument.data);
  const e = state.fieldErrors ?? {};
  return (
    <form
      action={formAction}
      className="panel flex max-w-3xl flex-col gap-4 p-4"
      noValidate
      aria-labelledby="new-run"
    >
      <h2 id="new-run" className="text-lg font-semibold">
        New run
      </h2>
      <input type="hidden" name="notebookId" value={notebookId} />
      <div className="grid grid-cols-1 gap-3 sm:grid-cols-2">
        <div className="flex max-w-full flex-col gap-1">
          <label htmlFor="run-instrumentId" className="text-sm font-medium">
            Instrument
          </label>
          <select
            id="run-instrumentId"
            value={instrumentId}
            onChange={(event) => {
              setInstrumentId(event.target.value);
              setSpectrumId("");
            }}
            className={selectClass}
          >
            {instruments.map((i) => (
              <option key={i.id} value={i.id}>
                {i.name}
              </option>
            ))}
          </select>
        </div>
        <div className="flex max-w-full flex-col gap-1">
          <label htmlFor="spectrumId" className="text-sm font-medium">
            Sample spectrum
          </label>
          <select
            id="spectrumId"
            name="spectrumId"
            value={sample?.id ?? ""}
            onChange={(event) => setSpectrumId(event.target.value)}
            disabled={samples.length === 0}
            aria-describedby="spectrumId-error"
            aria-busy={spectra.isLoading || undefined}
            className={selectClass}
          >
            {samples.length === 0 ? (
              <option value="">{loading ? "Loading the samples…" : "No sample spectra yet"}</option>
            ) : null}
            {samples.map((s) => (
              <option key={s.id} value={s.id}>
                {spectrumLabel(s)}
              </option>
            ))}
          </select>
          <div
            id="spectrumId-error"
            aria-live="polite"
            className="text-xs text-red-700 dark:text-red-300"
          >
            {e.spectrumId?.join(" ")}
            {spectra.error ? spectra.error.message : null}
          </div>
          {!loading && samples.length === 0 ? (
            <p className="muted text-xs">
              <Link
                href={`/instruments/${instrumentId}/upload?kind=sample&notebook=${notebookId}`}
                className="underline"
              >
                Upload a sample on this instrument
              </Link>{" "}
              first.
            </p>
          ) : null}
        </div>
        <div className="flex max-w-full flex-col gap-1">
          <label htmlFor="calibrationId" className="text-sm font-medium">
            Calibration
          </label>
          <select
            key={`${instrumentId}-${calibrations.length}-${allowOwnAxis}`}
            id="calibrationId"
            name="calibrationId"
            defaultValue={calibrations[0]?.id ?? ""}
            aria-describedby="calibrationId-error"
            className={selectClass}
          >
            {calibrations.map((c, i) => (
              <option key={c.id} value={c.id}>
                {calibrationLabel(c)}
                {i === 0 ? " (newest)" : ""}
              </option>
            ))}
            {allowOwnAxis ? (
              <option value="">None: the file&apos;s own wavelength axis (not lamp-checked)</option>
            ) : null}
            {!allowOwnAxis && calibrations.length === 0 ? (
              <option value="">No calibration yet</option>
            ) : null}
          </select>
          <div
            id="calibrationId-error"
            aria-live="polite"
            className="text-xs text-red-700 dark:text-red-300"
          >
            {e.calibrationId?.join(" ")}
            {needsCalibration ? (
              <span className="text-[var(--text)]">
                A sample on a pixel axis needs a lamp calibration:{" "}
                <Link href={`/instruments/${instrumentId}/calibrate`} className="underline">
                  calibrate the instrument
                </Link>{" "}
                first.
              </span>
            ) : null}
          </div>
        </div>
        <div className="flex max-w-full flex-col gap-1">
          <label htmlFor="source" className="text-sm font-medium">
            Kind of source
          </label>
          <select
            id="source"
            name="source"
            value={source}
            onChange={(event) => setSource(event.target.value)}
            aria-describedby="source-error"
            className={selectClass}
          >
            {SOURCES.map((s) => (
              <option key={s.value} value={s.value}>
                {s.label}
              </option>
            ))}
          </select>
          <div
            id="source-error"
            aria-live="polite"
            className="text-xs text-red-700 dark:text-red-300"
          >
            {e.source?.join(" ")}
          </div>
        </div>
      </div>
      {source === "flame" ? <FlameCautions /> : null}
      <details>
        <summary className="cursor-pointer text-sm font-medium">
          Analysis settings (optional; blank keeps the defaults)
        </summary>
        <p className="muted mt-2 text-xs" data-testid="settings-defaults">
          The defaults: minimum SNR {SAMPLE_ANALYSIS_DEFAULTS.minSnr}, match tolerance k{" "}
          {SAMPLE_ANALYSIS_DEFAULTS.k} σ, and the table&apos;s relative intensities (no
          temperature).
        </p>
        <div className="mt-3 grid grid-cols-1 gap-3 sm:grid-cols-3">
          <Field
            label="Minimum SNR of a peak"
            name="minSnr"
            inputMode="decimal"
            placeholder={SETTING_PLACEHOLDERS.minSnr}
            defaultValue={state.values?.minSnr}
            errors={e["settings.minSnr"]}
          />
          <Field
            label="Match tolerance k (σ)"
            name="k"
            inputMode="decimal"
            placeholder={SETTING_PLACEHOLDERS.k}
            defaultValue={state.values?.k}
            errors={e["settings.k"]}
          />
          <Field
            label="Excitation temperature (K)"
            name="temperatureK"
            inputMode="decimal"
            placeholder={SETTING_PLACEHOLDERS.temperatureK}
            defaultValue={state.values?.temperatureK}
            errors={e["settings.temperatureK"]}
            hint="Expected intensities follow LTE at this temperature where the table has g, A and upper energies."
          />
        </div>
      </details>
      <FormMessage message={state.message} />
      <div>
        <Button type="submit" pending={pending} disabled={!sample || needsCalibration}>
          {pending ? "Analysing…" : "Start the run"}
        </Button>
        <PendingStatus
          pending={pending}
          text="Analysing the sample: finding its peaks above the noise and the continuum, and matching them against the line table."
          testId="run-form-status"
        />
      </div>
    </form>
  );
}

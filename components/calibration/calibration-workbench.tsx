"use client";
// The calibration workbench: the chemist names the lamp gases, then sees the lamp spectrum with its
// paired lines, the residuals, the pairs and the model comparison; every change (exclude or include a
// pair, pair a peak by hand, switch the model, change the gases) asks the server for a new preview
// (debounced). Nothing is saved until "Save the calibration", which sends the same input to the same
// service. The numbers all come from the server; this component only lays them out.
import { useCallback, useEffect, useRef, useState, useTransition } from "react";
import type { SpectrumSeries } from "@/components/charts/spectrum-charts";
import { Button } from "@/components/ui/button";
import { FormMessage } from "@/components/ui/form-message";
import type { CalibrationPreview, CalibrationPreviewPair } from "@/lib/services/calibrations";
import type { FormState } from "@/lib/validation/form-state";
import type { CalibrationModelChoice } from "@/lib/spectrum/calibration";
import { CompetingPairing } from "./competing-pairing";
import { ModelComparison } from "./model-comparison";
import { PairChooser } from "./pair-chooser";
import { WorkbenchLampChart, WorkbenchResidualChart } from "./workbench-charts";
import { WorkbenchPairsTable } from "./workbench-pairs-table";
import { WarningList } from "@/components/ui/warning-list";

interface PairRef {
  pixel: number;
  wavelengthNm: number;
}

interface WorkbenchInput {
  instrumentId: string;
  spectrumId: string;
  lamps: string[];
  model: CalibrationModelChoice;
  excluded: PairRef[];
  added: PairRef[];
  /** Sent with the save only: why a doubtful calibration may still become the default. */
  confirmReason?: string;
}

interface PreviewError {
  message: string;
  fieldErrors?: Record<string, string[]>;
}

/** Quiet time after a change before the preview is asked for, so quick edits make one request. */
const DEBOUNCE_MS = 300;

const samePair = (a: PairRef, b: PairRef) =>
  Math.abs(a.pixel - b.pixel) < 1e-6 && Math.abs(a.wavelengthNm - b.wavelengthNm) < 1e-6;

export function CalibrationWorkbench({
  instrumentId,
  spectrumId,
  spectrum,
  xTitle,
  lampGases,
  models,
  saveAction,
}: {
  instrumentId: string;
  spectrumId: string;
  spectrum: SpectrumSeries;
  xTitle: string;
  lampGases: readonly string[];
  models: { value: CalibrationModelChoice; label: string }[];
  saveAction: (input: WorkbenchInput) => Promise<FormState>;
}) {
  const [input, setInput] = useState<WorkbenchInput>({
    instrumentId,
    spectrumId,
    lamps: ["Hg"],
    model: "auto",
    excluded: [],
    added: [],
  });
  const [started, setStarted] = useState(false);
  const [preview, setPreview] = useState<CalibrationPreview | null>(null);
  /** The input the shown preview was computed from: what Undo goes back to. */
  const [shownInput, setShownInput] = useState<WorkbenchInput | null>(null);
  const [error, setError] = useState<PreviewError | null>(null);
  const [busy, setBusy] = useState(false);
  const [chooserPeak, setChooserPeak] = useState<number | null>(null);
  const [saveState, setSaveState] = useState<FormState>({});
  const [confirmReason, setConfirmReason] = useState("");
  const [saving, startSaving] = useTransition();
  const request = useRef(0);
  const opener = useRef<HTMLElement | null>(null);

  const refresh = useCallback(async (wanted: WorkbenchInput, signal: AbortSignal) => {
    const id = ++request.current;
    setBusy(true);
    try {
      const response = await fetch("/api/calibrations/preview", {
        method: "POST",
        headers: { "content-type": "application/json" },
        body: JSON.stringify(wanted),
        signal,
      });
      const body = await response.json().catch(() => null);
      if (id !== request.current) return;
      if (!response.ok) {
        setError({
          message:
            body?.error?.message ??
            `The preview failed (HTTP ${response.status}). Your changes are kept; try again.`,
          fieldErrors: body?.error?.fieldErrors,
        });
      } else {
        setPreview(body as CalibrationPreview);
        setShownInput(wanted);
        setError(null);
      }
    } catch (caught) {
      if ((caught as Error).name === "AbortError" || id !== request.current) return;
      setError({ message: "The server could not be reached. Your changes are kept; try again." });
    } finally {
      if (id === request.current) setBusy(false);
    }
  }, []);

  useEffect(() => {
    if (!started) return;
    const controller = new AbortController();
    const timer = setTimeout(() => void refresh(input, controller.signal), DEBOUNCE_MS);
    return () => {
      clearTimeout(timer);
      controller.abort();
    };
  }, [input, started, refresh]);

  const change = (next: Partial<WorkbenchInput>) => {
    setSaveState({});
    setInput((current) => ({ ...current, ...next }));
  };
  const toggleLamp = (gas: string, on: boolean) =>
    change({
      lamps: on ? [...new Set([...input.lamps, gas])] : input.lamps.filter((g) => g !== gas),
    });
  const ref = (p: CalibrationPreviewPair): PairRef => ({
    pixel: p.pixel,
    wavelengthNm: p.wavelengthNm,
  });
  const openChooser = (peakIndex: number) => {
    opener.current = document.activeElement instanceof HTMLElement ? document.activeElement : null;
    setChooserPeak(peakIndex);
  };
  const closeChooser = () => {
    setChooserPeak(null);
    opener.current?.focus();
  };

  const lampsError = input.lamps.length === 0 ? "Choose at least one lamp gas." : null;
  const stale = busy || (shownInput !== null && shownInput !== input);
  const peaks = preview?.peaks ?? [];
  const unpaired = peaks.map((p, i) => ({ ...p, i })).filter((p) => !p.pairedWith);
  const doubts = preview?.result.doubts ?? [];
  const reasonError = saveState.fieldErrors?.confirmReason?.join(" ");
  const labels = Object.fromEntries(models.map((m) => [m.value, m.label]));
  const counts = preview
    ? {
        used: preview.result.pairs.filter((p) => p.state === "used").length,
        rejected: preview.result.pairs.filter((p) => p.state === "rejected").length,
        excluded: preview.result.pairs.filter((p) => p.state === "excluded").length,
        added: preview.result.pairs.filter((p) => p.origin === "added").length,
      }
    : null;

  return (
    <div className="flex flex-col gap-4">
      <section aria-labelledby="workbench-setup" className="panel flex flex-col gap-3 p-4">
        <h2 id="workbench-setup" className="sr-only">
          Lamp gases and model
        </h2>
        <div className="flex flex-wrap items-end gap-6">
          <fieldset aria-describedby="lamps-error">
            <legend className="mb-1 text-sm font-medium">Lamp gases in this spectrum</legend>
            <div className="flex flex-wrap gap-4 text-sm">
              {lampGases.map((gas) => (
                <label key={gas} className="flex items-center gap-1.5">
                  <input
                    type="checkbox"
                    name="lamps"
                    value={gas}
                    checked={input.lamps.includes(gas)}
                    onChange={(e) => toggleLamp(gas, e.target.checked)}
                  />
                  {gas}
                </label>
              ))}
            </div>
            <div
              id="lamps-error"
              aria-live="polite"
              className="text-xs text-red-700 dark:text-red-300"
            >
              {lampsError ?? error?.fieldErrors?.lamps?.join(" ")}
            </div>
          </fieldset>
          <div className="flex flex-col gap-1">
            <label htmlFor="workbench-model" className="text-sm font-medium">
              Dispersion model
            </label>
            <select
              id="workbench-model"
              value={input.model}
              onChange={(e) => change({ model: e.target.value as CalibrationModelChoice })}
              aria-describedby="workbench-model-hint workbench-model-error"
              className="rounded border border-[var(--line)] bg-[var(--panel)] px-2 py-1.5 text-sm"
            >
              {models.map((m) => (
                <option key={m.value} value={m.value}>
                  {m.label}
                </option>
              ))}
            </select>
            <p id="workbench-model-hint" className="muted text-xs">
              A grating is close to linear in pixel; a prism is better described by the Hartmann
              formula or its glass (from the catalogue; when the instrument names none and no
              catalogue glass fits the pairs, fitted from them).
            </p>
            <div
              id="workbench-model-error"
              aria-live="polite"
              className="text-xs text-red-700 dark:text-red-300"
            >
              {error?.fieldErrors?.model?.join(" ")}
            </div>
          </div>
          <Button
            type="button"
            variant={started ? "quiet" : "primary"}
            disabled={input.lamps.length === 0}
            pending={busy && !preview}
            onClick={() => {
              if (started) change({});
              setStarted(true);
            }}
          >
            {busy && !preview
              ? "Pairing and fitting…"
              : started
                ? "Pair again"
                : "Pair the lines and fit"}
          </Button>
        </div>
        <div
          role="status"
          aria-live="polite"
          data-testid="workbench-status"
          className="min-h-5 text-sm"
        >
          {busy ? (
            <span className="flex items-center gap-2">
              <span
                aria-hidden
                className="inline-block h-3 w-3 animate-spin rounded-full border-2 border-ember-600 border-t-transparent"
              />
              Updating the preview…
            </span>
          ) : preview && !error ? (
            <span className="muted">Preview up to date. Nothing is saved until you save it.</span>
          ) : !started ? (
            <span className="muted">
              Choose the lamp gases, then pair the lines. The preview saves nothing.
            </span>
          ) : null}
        </div>
        {error ? (
          <div
            role="alert"
            data-testid="workbench-error"
            className="flex flex-wrap items-center gap-3 rounded border border-red-700 p-2 text-sm text-red-700 dark:text-red-300"
          >
            <p>{error.message}</p>
            {shownInput && shownInput !== input ? (
              <button
                type="button"
                onClick={() => setInput(shownInput)}
                className="rounded border border-[var(--line)] px-2 py-0.5 text-xs text-[var(--ink)] hover:bg-ink-100 dark:hover:bg-ink-800"
              >
                Undo that change
              </button>
            ) : null}
          </div>
        ) : null}
      </section>

      {preview && counts ? (
        <div
          className={`flex flex-col gap-4 transition-opacity ${stale ? "opacity-60" : ""}`}
          aria-busy={busy || undefined}
        >
          <dl
            className="panel grid grid-cols-2 gap-x-6 gap-y-2 p-4 text-sm sm:grid-cols-4"
            data-testid="workbench-summary"
          >
            <div>
              <dt className="muted">Model</dt>
              <dd className="font-mono">{preview.result.model}</dd>
            </div>
            <div>
              <dt className="muted">RMS</dt>
              <dd className="font-mono" data-testid="workbench-rms">
                {preview.result.rmsNm.toFixed(4)} nm
              </dd>
            </div>
            <div>
              <dt className="muted">Pairs used / rejected / excluded</dt>
              <dd className="font-mono">
                {counts.used} / {counts.rejected} / {counts.excluded} (dof {preview.result.dof})
              </dd>
            </div>
            <div>
              <dt className="muted">Covered range</dt>
              <dd className="font-mono">
                {preview.result.coveredRangeNm[0].toFixed(2)}–
                {preview.result.coveredRangeNm[1].toFixed(2)} nm
              </dd>
            </div>
            <div>
              <dt className="muted">Fit uncertainty (1σ, median / max)</dt>
              <dd className="font-mono">
                {preview.result.uncertainty.medianNm.toFixed(4)} /{" "}
                {preview.result.uncertainty.maxNm.toFixed(4)} nm
              </dd>
            </div>
            <div>
              <dt className="muted">Paired by hand</dt>
              <dd className="font-mono">{counts.added}</dd>
            </div>
            <div>
              <dt className="muted">Line-table release</dt>
              <dd className="font-mono">{preview.lineRelease.number}</dd>
            </div>
            <div>
              <dt className="muted">Pairing</dt>
              <dd>
                {preview.result.pairing.status}, confidence{" "}
                {preview.result.pairing.confidence.toFixed(2)}
              </dd>
            </div>
          </dl>
          <p className="muted text-sm" data-testid="pairing-message">
            How it was paired: {preview.result.pairing.message}
          </p>
          <WarningList warnings={preview.result.warnings} />

          {preview.result.rival.length > 0 ? (
            <CompetingPairing
              rival={preview.result.rival}
              tried={preview.result.rival.every((r) => input.added.some((a) => samePair(a, r)))}
              disabled={busy}
              onTry={() =>
                change({
                  excluded: preview.result.pairs.filter((p) => p.origin === "auto").map(ref),
                  added: preview.result.rival.map((r) => ({
                    pixel: r.pixel,
                    wavelengthNm: r.wavelengthNm,
                  })),
                })
              }
              onBack={() => change({ excluded: [], added: [] })}
            />
          ) : null}
          <WorkbenchLampChart
            spectrum={spectrum}
            preview={preview}
            xTitle={xTitle}
            onPeakClick={openChooser}
          />
          {chooserPeak !== null && peaks[chooserPeak] ? (
            <PairChooser
              peak={peaks[chooserPeak]}
              lines={preview.lines}
              onClose={closeChooser}
              onChoose={(wavelengthNm) => {
                change({
                  added: [...input.added, { pixel: peaks[chooserPeak].pixel, wavelengthNm }],
                });
                setChooserPeak(null);
              }}
            />
          ) : null}
          <section aria-labelledby="unpaired-heading" className="panel p-3">
            <h2 id="unpaired-heading" className="mb-1 text-sm font-semibold">
              Unpaired peaks ({unpaired.length})
            </h2>
            {unpaired.length === 0 ? (
              <p className="muted text-sm">Every peak found is paired with a line.</p>
            ) : (
              <ul className="flex flex-wrap gap-2" data-testid="unpaired-peaks">
                {unpaired.map((p) => (
                  <li key={p.pixel}>
                    <button
                      type="button"
                      disabled={busy}
                      onClick={() => openChooser(p.i)}
                      className="rounded border border-[var(--line)] px-2 py-1 text-xs hover:bg-ink-100 disabled:opacity-50 dark:hover:bg-ink-800"
                    >
                      Pair the peak at pixel {p.pixel.toFixed(1)}
                      {p.predictedNm !== null ? ` (≈ ${p.predictedNm.toFixed(2)} nm)` : ""}, SNR{" "}
                      {p.snr.toFixed(0)}
                      {p.unpaired ? (
                        <>
                          {" — "}
                          <span data-testid="unpaired-reason">{p.unpaired.reason}</span>
                          {p.unpaired.lines.length > 0
                            ? ` (${p.unpaired.lines.map((l) => `${l.species} ${l.wavelengthNm.toFixed(3)}`).join(", ")} nm)`
                            : ""}
                        </>
                      ) : null}
                    </button>
                  </li>
                ))}
              </ul>
            )}
            <h3 id="expected-heading" className="mt-3 mb-1 text-sm font-semibold">
              Expected lines with no peak ({preview.expectedWithoutPeak.length})
            </h3>
            {preview.expectedWithoutPeak.length === 0 ? (
              <p className="muted text-sm">
                Every lamp line the calibration puts on the array has a peak within{" "}
                {preview.tolerances.expectedPeakReachFwhm} FWHM of it.
              </p>
            ) : (
              <ul
                aria-labelledby="expected-heading"
                className="flex flex-wrap gap-x-4 gap-y-1 text-sm"
                data-testid="expected-without-peak"
              >
                {preview.expectedWithoutPeak.map((l) => (
                  <li key={`${l.species}-${l.wavelengthNm}`}>
                    {l.species} <span className="font-mono">{l.wavelengthNm.toFixed(3)} nm</span> —{" "}
                    {l.reason}
                  </li>
                ))}
              </ul>
            )}
          </section>
          <WorkbenchResidualChart preview={preview} xTitle={xTitle} />
          <WorkbenchPairsTable
            pairs={preview.result.pairs}
            coveredRangeNm={preview.result.coveredRangeNm}
            xTitle={xTitle}
            disabled={busy}
            onExclude={(p) => change({ excluded: [...input.excluded, ref(p)] })}
            onInclude={(p) =>
              change({ excluded: input.excluded.filter((e) => !samePair(e, ref(p))) })
            }
            onRemove={(p) => {
              // The hand pair the server resolved to this one: its line within the server's match, the nearest pixel.
              const candidates = input.added.filter(
                (a) => Math.abs(a.wavelengthNm - p.wavelengthNm) <= preview.tolerances.lineMatchNm,
              );
              const given = candidates.reduce<PairRef | null>(
                (best, a) =>
                  best === null || Math.abs(a.pixel - p.pixel) < Math.abs(best.pixel - p.pixel)
                    ? a
                    : best,
                null,
              );
              change({ added: input.added.filter((a) => a !== given) });
            }}
          />
          <ModelComparison
            comparison={preview.comparison}
            chosenModel={preview.result.model}
            labels={labels}
          />

          <section aria-labelledby="save-heading" className="panel flex flex-col gap-2 p-4">
            <h2 id="save-heading" className="text-sm font-semibold">
              Save
            </h2>
            <p className="muted text-sm">
              Saves the model, its coefficients, the pairs, RMS, uncertainty, covered range and
              line-table release {preview.lineRelease.number}. The newest calibration of the
              instrument becomes the default for new runs; its page shows the drift from the
              previous one.
            </p>
            {doubts.length > 0 ? (
              <div
                className="flex flex-col gap-2 rounded border border-ember-600 p-3 text-sm"
                data-testid="calibration-doubts"
              >
                <p id="doubts-heading" className="font-semibold">
                  <span aria-hidden>⚠ </span>This calibration is doubtful. It becomes the
                  instrument&rsquo;s default only with a reason:
                </p>
                <ul aria-labelledby="doubts-heading" className="list-disc pl-5">
                  {doubts.map((d) => (
                    <li key={d}>{d}</li>
                  ))}
                </ul>
                <label htmlFor="confirm-reason" className="font-medium">
                  Why it can be trusted (10–500 characters)
                </label>
                <textarea
                  id="confirm-reason"
                  name="confirmReason"
                  required
                  minLength={10}
                  maxLength={500}
                  rows={3}
                  value={confirmReason}
                  onChange={(e) => setConfirmReason(e.target.value)}
                  aria-invalid={reasonError ? true : undefined}
                  aria-describedby="confirm-reason-error"
                  className="rounded border border-[var(--line)] bg-[var(--panel)] px-2 py-1.5"
                />
                <div
                  id="confirm-reason-error"
                  aria-live="polite"
                  className="text-xs text-red-700 dark:text-red-300"
                >
                  {reasonError}
                </div>
              </div>
            ) : null}
            <FormMessage message={saveState.message} />
            <div>
              <Button
                type="button"
                disabled={stale || error !== null}
                pending={saving}
                onClick={() =>
                  startSaving(async () => {
                    const reason = confirmReason.trim();
                    const state = await saveAction(
                      doubts.length > 0 && reason ? { ...input, confirmReason: reason } : input,
                    );
                    setSaveState(state);
                  })
                }
              >
                {saving ? "Saving…" : "Save the calibration"}
              </Button>
            </div>
          </section>
        </div>
      ) : null}
    </div>
  );
}

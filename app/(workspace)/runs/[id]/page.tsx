// One identification run: the calibrated spectrum (raw or continuum-removed) with the identified lines
// labelled, what changed since the run it repeats, the calls with their evidence and overrides, the
// excitation temperature, the unexplained peaks, the peaks, the notes, the run's warnings and what it
// was made from.
import { wavelengthColumnDecimals } from "@/lib/reports/wavelength-column";
import Link from "next/link";
import { RunSpectrumChart } from "@/components/charts/spectrum-charts";
import { RunDownloads } from "@/components/reports/run-downloads";
import { RunReviewPanel } from "@/components/review/run-review-panel";
import { PageHeader } from "@/components/ui/page-header";
import { RunChangesPanel } from "@/components/runs/run-changes";
import { CallEvidence, PeakTable } from "@/components/runs/run-evidence";
import { RunNotes } from "@/components/runs/run-notes";
import { runChartLabels } from "@/components/runs/run-labels";
import { RunNotices } from "@/components/runs/run-notices";
import { RunOverrideForm } from "@/components/runs/run-override-form";
import { RunRerunButton } from "@/components/runs/run-rerun";
import { RunTemperaturePanel } from "@/components/runs/run-temperature";
import { idOrNotFound, orNotFound } from "@/lib/http/page-not-found";
import { fetchRunSeries } from "@/lib/services/run-spectrum";
import { fetchCalibration } from "@/lib/services/calibrations";
import { fetchInstrument } from "@/lib/services/instruments";
import { authorMayEdit } from "@/lib/services/run-lifecycle";
import { fetchRun, fetchRunChanges, newerReleaseFor } from "@/lib/services/runs";
import { fetchSpectrum } from "@/lib/services/spectra";
import { requireWorkspace } from "@/lib/services/workspace";
import { EntityTrail } from "@/components/audit/entity-trail";
import { overrideCallAction, rerunAction, saveRunNotesAction } from "./actions";
import { countOf } from "@/lib/text/count-of";
import { analysisSettingRows } from "@/components/runs/analysis-settings";
import { Fragment } from "react";

export const metadata = { title: "Run" };

export default async function RunPage({ params }: { params: Promise<{ id: string }> }) {
  const { actor } = await requireWorkspace();
  const run = await orNotFound(fetchRun(actor, idOrNotFound((await params).id)));
  const spectrum = await fetchSpectrum(actor, run.spectrumId);
  const [instrument, calibration, series, changes, newer] = await Promise.all([
    fetchInstrument(actor, spectrum.instrumentId),
    run.calibrationId ? fetchCalibration(actor, run.calibrationId) : Promise.resolve(null),
    orNotFound(fetchRunSeries(actor, run.id)),
    fetchRunChanges(actor, run),
    newerReleaseFor(actor, run.id).catch(() => null),
  ]);
  const editable = authorMayEdit(actor, run);
  const labels = runChartLabels(run.calls);
  const present = run.calls.filter((c) => c.verdict === "present").map((c) => c.species);
  return (
    <>
      <PageHeader
        title={`Run: ${spectrum.label || spectrum.fileName}`}
        description={`${run.source} on ${instrument.name} · ${run.createdAt.slice(0, 16).replace("T", " ")} · ${countOf(run.peaks.length, "peak")} · called present: ${present.length ? present.join(", ") : "none"}`}
        actions={
          <div className="flex flex-wrap items-start gap-2">
            {newer ? (
              <RunRerunButton
                releaseNumber={newer.number}
                action={rerunAction.bind(null, run.id)}
              />
            ) : null}
            <Link
              href={`/notebooks/${run.notebookId}`}
              className="rounded border border-[var(--line)] px-3 py-1.5 text-sm hover:bg-ink-100 dark:hover:bg-ink-800"
            >
              Back to the notebook
            </Link>
          </div>
        }
      />
      <RunReviewPanel runId={run.id} />
      <RunNotices run={run} coveredRangeNm={calibration?.coveredRangeNm ?? null} />
      {changes ? <RunChangesPanel changes={changes} /> : null}
      <h2 className="mb-2 mt-6 text-lg font-semibold">Spectrum</h2>
      <RunSpectrumChart
        spectrum={series.spectrum}
        continuum={series.continuum}
        labels={labels}
        unexplainedNm={run.unexplained.map((u) => u.wavelengthNm)}
      />
      <h2 className="mb-2 mt-6 text-lg font-semibold">Calls and their evidence</h2>
      <CallEvidence
        calls={run.calls}
        peaks={run.peaks}
        overrideFormFor={
          editable
            ? (call) => (
                <RunOverrideForm
                  species={call.species}
                  computedVerdict={call.computedVerdict}
                  overridden={call.override !== null}
                  action={overrideCallAction.bind(null, run.id)}
                />
              )
            : undefined
        }
      />
      <h2 className="mb-2 mt-6 text-lg font-semibold">Excitation temperature</h2>
      <RunTemperaturePanel temperature={run.temperature} assumedK={run.settings.temperatureK} />
      <h2 className="mb-2 mt-6 text-lg font-semibold">Unexplained peaks</h2>
      {run.unexplained.length === 0 ? (
        <p className="muted text-sm">Every peak above the threshold has a candidate line.</p>
      ) : (
        <ul className="panel divide-y divide-[var(--line)] text-sm" data-testid="unexplained">
          {run.unexplained.map((u) => (
            <li key={u.wavelengthNm} className="flex gap-4 px-3 py-1.5">
              <span className="font-mono">
                {u.wavelengthNm.toFixed(
                  wavelengthColumnDecimals(run.peaks.map((p) => p.uncertaintyNm)),
                )}{" "}
                nm
              </span>
              <span className="font-mono">SNR {u.snr.toFixed(1)}</span>
              <span className="muted">{u.reason}</span>
            </li>
          ))}
        </ul>
      )}
      <h2 className="mb-2 mt-6 text-lg font-semibold">Peaks</h2>
      <PeakTable peaks={run.peaks} />
      <h2 className="mb-2 mt-6 text-lg font-semibold">Notes</h2>
      <RunNotes
        notes={run.notes}
        lockVersion={run.lockVersion}
        editable={editable}
        action={saveRunNotesAction.bind(null, run.id)}
      />
      <h2 className="mb-2 mt-6 text-lg font-semibold">Made from</h2>
      <dl className="grid max-w-3xl grid-cols-[max-content_1fr] gap-x-4 gap-y-1 text-sm">
        <dt className="muted">Calibration</dt>
        <dd>
          {calibration ? (
            <Link href={`/calibrations/${calibration.id}`} className="underline">
              {calibration.calibratedOn} · {calibration.model} · RMS {calibration.rmsNm.toFixed(3)}{" "}
              nm
            </Link>
          ) : (
            "none (the file's own axis)"
          )}
        </dd>
        <dt className="muted">Line-table release</dt>
        <dd className="text-xs">
          {run.lineReleaseNumber !== null ? `Release ${run.lineReleaseNumber} · ` : ""}
          <span className="font-mono">{run.lineReleaseId}</span>
        </dd>
        {run.rerunOfId ? (
          <>
            <dt className="muted">Re-run of</dt>
            <dd>
              <Link href={`/runs/${run.rerunOfId}`} className="underline">
                the earlier run
              </Link>
            </dd>
          </>
        ) : null}
        {analysisSettingRows(run.settings).map((setting) => (
          <Fragment key={setting.label}>
            <dt className="muted">{setting.label}</dt>
            <dd className="font-mono text-xs" data-testid="run-setting">
              {setting.value}
            </dd>
          </Fragment>
        ))}
        <dt className="muted">Noise</dt>
        <dd className="font-mono text-xs">{run.noiseCounts.toFixed(2)} counts</dd>
        <dt className="muted">Software</dt>
        <dd className="font-mono text-xs">{run.softwareVersion}</dd>
        <dt className="muted">Raw file SHA-256</dt>
        <dd className="break-all font-mono text-xs">{spectrum.sha256}</dd>
      </dl>
      <RunDownloads runId={run.id} />
      <EntityTrail entity="run" entityId={run.id} />
    </>
  );
}

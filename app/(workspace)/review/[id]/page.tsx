// Reviewing one run: everything the run page shows (chart, notices, calls with evidence, unexplained
// peaks, peaks, what it was made from) plus the calibration's pairs and residuals and the settings, a
// mark form on each call and its lines, the rounds so far, and Return with comments or Sign.
import { wavelengthColumnDecimals } from "@/lib/reports/wavelength-column";
import Link from "next/link";
import { redirect } from "next/navigation";
import {
  ResidualChart,
  RunSpectrumChart,
  type PairMark,
} from "@/components/charts/spectrum-charts";
import { decisionOutcome } from "@/components/review/decision-outcome";
import { ReviewHistory } from "@/components/review/review-history";
import { MarkForm, ReturnForm, SignForm } from "@/components/review/review-forms";
import { PageHeader } from "@/components/ui/page-header";
import { CallEvidence, PeakTable, VerdictBadge } from "@/components/runs/run-evidence";
import { runChartLabels } from "@/components/runs/run-labels";
import { RunNotices } from "@/components/runs/run-notices";
import { idOrNotFound, orNotFound } from "@/lib/http/page-not-found";
import { fetchRunSeries } from "@/lib/services/run-spectrum";
import { X_TITLES } from "@/components/uploads/first-column-labels";
import { fetchCalibration } from "@/lib/services/calibrations";
import { fetchInstrument } from "@/lib/services/instruments";
import { SIGNATURE_MEANING } from "@/lib/services/run-review-decisions";
import { fetchRunReviewState } from "@/lib/services/run-review-history";
import { fetchRun } from "@/lib/services/runs";
import { fetchSpectrum } from "@/lib/services/spectra";
import { requireWorkspace } from "@/lib/services/workspace";
import { addMarkAction, decideRunAction } from "../actions";
import { countOf } from "@/lib/text/count-of";
import { analysisSettingRows } from "@/components/runs/analysis-settings";
import { Fragment } from "react";
import { TableScroll } from "@/components/ui/table-scroll";
import { presentSpecies } from "@/lib/runs/standing-verdicts";

export const metadata = { title: "Review a run" };

export default async function ReviewRunPage({ params }: { params: Promise<{ id: string }> }) {
  const { actor } = await requireWorkspace();
  const runId = idOrNotFound((await params).id);
  const run = await orNotFound(fetchRun(actor, runId));
  const review = await fetchRunReviewState(actor, runId);
  // Only supervisors review; anyone else following a link sees the run itself.
  if (!review.isReviewer) redirect(`/runs/${runId}`);
  const spectrum = await fetchSpectrum(actor, run.spectrumId);
  const [instrument, calibration, series] = await Promise.all([
    fetchInstrument(actor, spectrum.instrumentId),
    run.calibrationId ? fetchCalibration(actor, run.calibrationId) : Promise.resolve(null),
    orNotFound(fetchRunSeries(actor, run.id)),
  ]);
  const labels = runChartLabels(run.calls);
  const present = presentSpecies(run.verdicts);
  const pairs: PairMark[] = calibration
    ? [
        ...calibration.pairs.map((p) => ({ ...p, used: true })),
        ...calibration.rejected.map((p) => ({ ...p, used: false })),
      ].sort((a, b) => a.pixel - b.pixel)
    : [];
  // Once decided (or not yet submitted) the page says what happened; the author's own run keeps the
  // refusal, which is the reason they cannot decide it.
  const outcome = review.isAuthor ? null : decisionOutcome(review.history, actor.id);
  const toReview = [...run.calls]
    .filter((c) => c.verdict !== "absent" || run.verdicts[c.species] !== "absent")
    .sort((a, b) => b.score - a.score);
  return (
    <>
      <PageHeader
        title={`Review: ${spectrum.label || spectrum.fileName}`}
        description={`${run.source} on ${instrument.name} · ${run.createdAt.slice(0, 16).replace("T", " ")} · ${review.statusLabel} · version ${run.versionNumber}${run.reviewRound ? ` · round ${run.reviewRound}` : ""} · called present: ${present.length ? present.join(", ") : "none"}`}
        actions={
          <>
            <Link
              href="/review"
              className="rounded border border-[var(--line)] px-3 py-1.5 text-sm hover:bg-ink-100 dark:hover:bg-ink-800"
            >
              Back to the queue
            </Link>
            <Link
              href={`/runs/${run.id}`}
              className="rounded border border-[var(--line)] px-3 py-1.5 text-sm hover:bg-ink-100 dark:hover:bg-ink-800"
            >
              Open the run
            </Link>
          </>
        }
      />
      <RunNotices run={run} coveredRangeNm={calibration?.coveredRangeNm ?? null}>
        {outcome ? (
          <p
            role="status"
            className="rounded border border-teal-700 p-2 text-sm"
            data-testid="review-outcome"
          >
            <span className="font-semibold">{outcome.title}. </span>
            {outcome.text}
          </p>
        ) : review.whyNotDecide ? (
          <p
            role="note"
            className="rounded border border-ember-600 p-2 text-sm"
            data-testid="why-not-review"
          >
            {review.whyNotDecide}
          </p>
        ) : null}
      </RunNotices>

      <RunSpectrumChart
        spectrum={series.spectrum}
        continuum={series.continuum}
        labels={labels}
        unexplainedNm={run.unexplained.map((u) => u.wavelengthNm)}
      />

      <h2 className="mb-2 mt-6 text-lg font-semibold">The calls to review</h2>
      {toReview.length === 0 ? (
        <p className="muted text-sm">
          No element is called present or possible: there is no call to mark.
        </p>
      ) : (
        <ul className="flex flex-col gap-2" data-testid="calls-to-review">
          {toReview.map((call) => {
            const standing = run.verdicts[call.species] ?? call.verdict;
            const override = [...run.overrides].reverse().find((o) => o.species === call.species);
            return (
              <li key={call.species} className="panel p-3" data-testid="call-to-review">
                <p className="flex flex-wrap items-baseline gap-2">
                  <span className="font-semibold">{call.species}</span>
                  <VerdictBadge verdict={standing} />
                  {standing !== call.verdict ? (
                    <span className="muted text-xs">(computed: {call.verdict})</span>
                  ) : null}
                  <span className="font-mono text-xs">score {call.score.toFixed(2)}</span>
                  <span className="muted text-xs">
                    {countOf(call.seenCount, "line")} seen · {call.missingCount} missing
                  </span>
                </p>
                {override && override.verdict !== null ? (
                  <p className="mt-1 text-xs">
                    Overridden by {override.byName ?? "the author"}: {override.reason}
                  </p>
                ) : null}
                {review.mayDecide ? (
                  <MarkForm
                    runId={run.id}
                    species={call.species}
                    lines={[
                      ...call.lines.map((l) => ({
                        lineNm: l.lineNm,
                        label: `${l.lineNm.toFixed(3)} nm (seen, Δλ ${l.deltaNm.toFixed(3)} nm)`,
                      })),
                      ...call.missing.map((m) => ({
                        lineNm: m.lineNm,
                        label: `${m.lineNm.toFixed(3)} nm (expected, missing)`,
                      })),
                    ]}
                    action={addMarkAction}
                  />
                ) : null}
              </li>
            );
          })}
        </ul>
      )}

      <h2 className="mb-2 mt-6 text-lg font-semibold">Rounds and marks</h2>
      <ReviewHistory history={review.history} />

      {review.mayDecide ? (
        <section aria-labelledby="decide-title" className="mt-6">
          <h2 id="decide-title" className="mb-2 text-lg font-semibold">
            Decide
          </h2>
          <div className="grid gap-4 lg:grid-cols-2">
            <ReturnForm runId={run.id} action={decideRunAction} />
            <SignForm
              runId={run.id}
              meaning={SIGNATURE_MEANING}
              signerName={actor.name}
              action={decideRunAction}
            />
          </div>
        </section>
      ) : null}

      <h2 className="mb-2 mt-6 text-lg font-semibold">Calls and their evidence</h2>
      <CallEvidence calls={run.calls} peaks={run.peaks} />
      <h2 className="mb-2 mt-6 text-lg font-semibold">Unexplained peaks</h2>
      {run.unexplained.length === 0 ? (
        <p className="muted text-sm">Every peak above the threshold has a candidate line.</p>
      ) : (
        <ul className="panel divide-y divide-[var(--line)] text-sm">
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

      <h2 className="mb-2 mt-6 text-lg font-semibold">Calibration used</h2>
      {calibration ? (
        <>
          <p className="mb-2 text-sm">
            <Link href={`/calibrations/${calibration.id}`} className="underline">
              {calibration.calibratedOn} · {calibration.model} · RMS {calibration.rmsNm.toFixed(4)}{" "}
              nm
            </Link>{" "}
            · {countOf(calibration.pairs.length, "pair")} used, {calibration.rejected.length}{" "}
            rejected · covers {calibration.coveredRangeNm[0].toFixed(1)}–
            {calibration.coveredRangeNm[1].toFixed(1)} nm
          </p>
          <ResidualChart pairs={pairs} xTitle={X_TITLES[spectrum.xUnit]} />
          <TableScroll label="Lamp pairs and residuals" className="panel mt-2">
            <table className="w-full text-sm" data-testid="review-pairs">
              <caption className="px-3 py-1 text-left text-xs font-semibold">
                Lamp pairs and residuals
              </caption>
              <thead className="text-left text-xs">
                <tr>
                  <th scope="col" className="px-3">
                    Pixel
                  </th>
                  <th scope="col" className="px-3">
                    Line
                  </th>
                  <th scope="col" className="px-3">
                    Wavelength (nm)
                  </th>
                  <th scope="col" className="px-3">
                    Residual (nm)
                  </th>
                  <th scope="col" className="px-3">
                    Used
                  </th>
                </tr>
              </thead>
              <tbody className="font-mono text-xs">
                {pairs.map((p) => (
                  <tr key={`${p.pixel}-${p.wavelengthNm}`}>
                    <td className="px-3">{p.pixel.toFixed(2)}</td>
                    <td className="px-3 font-sans">{p.species ?? "—"}</td>
                    <td className="px-3">{p.wavelengthNm.toFixed(4)}</td>
                    <td className="px-3">{p.residualNm.toFixed(4)}</td>
                    <td className="px-3 font-sans">{p.used ? "yes" : "rejected"}</td>
                  </tr>
                ))}
              </tbody>
            </table>
          </TableScroll>
        </>
      ) : (
        <p className="text-sm">None: the run used the file&apos;s own wavelength axis.</p>
      )}

      <h2 className="mb-2 mt-6 text-lg font-semibold">Settings and provenance</h2>
      <dl
        className="grid max-w-3xl grid-cols-[max-content_1fr] gap-x-4 gap-y-1 text-sm"
        data-testid="review-settings"
      >
        {analysisSettingRows(run.settings).map((setting) => (
          <Fragment key={setting.label}>
            <dt className="muted">{setting.label}</dt>
            <dd className="font-mono text-xs">{setting.value}</dd>
          </Fragment>
        ))}
        <dt className="muted">Line-table release</dt>
        <dd className="font-mono text-xs">{run.lineReleaseId}</dd>
        <dt className="muted">Noise</dt>
        <dd className="font-mono text-xs">{run.noiseCounts.toFixed(2)} counts</dd>
        <dt className="muted">Software</dt>
        <dd className="font-mono text-xs">{run.softwareVersion}</dd>
        <dt className="muted">Raw file SHA-256</dt>
        <dd className="break-all font-mono text-xs">{spectrum.sha256}</dd>
        <dt className="muted">Notes</dt>
        <dd className="whitespace-pre-wrap">{run.notes || <span className="muted">none</span>}</dd>
      </dl>
    </>
  );
}

// One lamp calibration: the lamp spectrum with its paired lines, the residuals, the pairs, the model,
// RMS, covered range, uncertainty and the drift from the instrument's previous calibration.
import Link from "next/link";
import { LampChart, ResidualChart, type PairMark } from "@/components/charts/spectrum-charts";
import { PageHeader } from "@/components/ui/page-header";
import { idOrNotFound, orNotFound } from "@/lib/http/page-not-found";
import { fetchSpectrumSeries } from "@/lib/services/run-spectrum";
import { X_TITLES } from "@/components/uploads/first-column-labels";
import { fetchCalibrationView } from "@/lib/services/calibrations";
import { fetchInstrument } from "@/lib/services/instruments";
import { fetchSpectrum } from "@/lib/services/spectra";
import { requireWorkspace } from "@/lib/services/workspace";
import { EntityTrail } from "@/components/audit/entity-trail";
import { TableScroll } from "@/components/ui/table-scroll";
import { WarningList } from "@/components/ui/warning-list";
import { OutsideCoveredNote } from "@/components/calibration/outside-covered-note";

export const metadata = { title: "Calibration" };

export default async function CalibrationPage({ params }: { params: Promise<{ id: string }> }) {
  const { actor } = await requireWorkspace();
  const { calibration, releaseNumber, previous } = await orNotFound(
    fetchCalibrationView(actor, idOrNotFound((await params).id)),
  );
  const [instrument, spectrum, series] = await Promise.all([
    fetchInstrument(actor, calibration.instrumentId),
    fetchSpectrum(actor, calibration.spectrumId),
    orNotFound(fetchSpectrumSeries(actor, calibration.spectrumId)),
  ]);
  const pairs: PairMark[] = [
    ...calibration.pairs.map((p) => ({ ...p, used: true })),
    ...calibration.rejected.map((p) => ({ ...p, used: false })),
  ].sort((a, b) => a.pixel - b.pixel);
  const xTitle = X_TITLES[spectrum.xUnit];
  return (
    <>
      <PageHeader
        title={`Calibration of ${instrument.name}, ${calibration.calibratedOn}: ${calibration.label}`}
        description={`From ${spectrum.label || spectrum.fileName} · lamps ${calibration.lamps.join(", ")}`}
        actions={
          <Link
            href={`/instruments/${instrument.id}`}
            className="rounded border border-[var(--line)] px-3 py-1.5 text-sm hover:bg-ink-100 dark:hover:bg-ink-800"
          >
            Back to the instrument
          </Link>
        }
      />
      <dl
        className="panel mb-4 grid grid-cols-2 gap-x-6 gap-y-2 p-4 text-sm sm:grid-cols-4"
        data-testid="calibration-summary"
      >
        <div>
          <dt className="muted">Model</dt>
          <dd className="font-mono">{calibration.model}</dd>
        </div>
        <div>
          <dt className="muted">RMS</dt>
          <dd className="font-mono">{calibration.rmsNm.toFixed(4)} nm</dd>
        </div>
        <div>
          <dt className="muted">Pairs used / rejected</dt>
          <dd className="font-mono">
            {calibration.pairs.length} / {calibration.rejected.length} (dof {calibration.dof})
          </dd>
        </div>
        <div>
          <dt className="muted">Covered range</dt>
          <dd className="font-mono">
            {calibration.coveredRangeNm[0].toFixed(2)}–{calibration.coveredRangeNm[1].toFixed(2)} nm
          </dd>
        </div>
        <div>
          <dt className="muted">Fit uncertainty (1σ, median / max)</dt>
          <dd className="font-mono">
            {calibration.uncertainty.medianNm.toFixed(4)} /{" "}
            {calibration.uncertainty.maxNm.toFixed(4)} nm
          </dd>
        </div>
        <div>
          <dt className="muted">Drift from the previous calibration</dt>
          <dd className="font-mono">
            {calibration.drift ? (
              <Link
                href={`/calibrations/${calibration.drift.previousCalibrationId}`}
                className="underline"
              >
                max {calibration.drift.maxAbsNm.toFixed(3)} nm
              </Link>
            ) : (
              "none (first calibration)"
            )}
          </dd>
        </div>
        <div>
          <dt className="muted">Pairing</dt>
          <dd>
            {calibration.pairing.status}, confidence {calibration.pairing.confidence.toFixed(2)}
          </dd>
        </div>
        <div>
          <dt className="muted">Line-table release</dt>
          <dd className="font-mono">{releaseNumber ?? "—"}</dd>
        </div>
        <div>
          <dt className="muted">Changed by hand</dt>
          <dd>
            {calibration.pairing.excludedByHand ?? 0} excluded,{" "}
            {calibration.pairing.addedByHand ?? 0} added
            {calibration.pairing.manualSeeds
              ? `, ${calibration.pairing.manualSeeds} seed pairs`
              : ""}
          </dd>
        </div>
        <div>
          <dt className="muted">Requested model</dt>
          <dd className="font-mono">{calibration.requestedModel}</dd>
        </div>
        <div>
          <dt className="muted">Software</dt>
          <dd className="font-mono">{calibration.softwareVersion}</dd>
        </div>
      </dl>
      <p className="muted mb-4 px-1 text-sm" data-testid="pairing-message">
        How it was paired: {calibration.pairing.message}
      </p>
      <WarningList warnings={calibration.warnings} alert className="mb-4" />
      {calibration.pairing.confirmation ? (
        <section
          aria-labelledby="confirmation-heading"
          className="panel mb-4 border-ember-600 p-4"
          data-testid="calibration-confirmation"
        >
          <h2 id="confirmation-heading" className="mb-1 text-sm font-semibold">
            <span aria-hidden>⚠ </span>Saved as the default despite its doubts
          </h2>
          <ul className="mb-2 list-disc pl-5 text-sm">
            {calibration.pairing.confirmation.doubts.map((d) => (
              <li key={d}>{d}</li>
            ))}
          </ul>
          <p className="text-sm">
            <span className="muted">Reason given: </span>
            {calibration.pairing.confirmation.reason}
          </p>
        </section>
      ) : null}
      {calibration.pairing.handPairs?.length ? (
        <section aria-labelledby="hand-heading" className="panel mb-4 p-4" data-testid="hand-pairs">
          <h2 id="hand-heading" className="mb-1 text-sm font-semibold">
            Pairs changed by hand on the workbench
          </h2>
          <ul className="flex flex-col gap-0.5 text-sm">
            {calibration.pairing.handPairs.map((p) => (
              <li key={`${p.change}-${p.pixel}-${p.wavelengthNm}`}>
                {p.change === "excluded" ? "Excluded" : "Added"}: pixel{" "}
                <span className="font-mono">{p.pixel.toFixed(2)}</span> with {p.species}{" "}
                <span className="font-mono">{p.wavelengthNm.toFixed(3)} nm</span>
              </li>
            ))}
          </ul>
        </section>
      ) : null}
      <section
        aria-labelledby="drift-heading"
        className="panel mb-4 p-4"
        data-testid="calibration-drift"
      >
        <h2 id="drift-heading" className="mb-1 text-sm font-semibold">
          Drift from the previous calibration
        </h2>
        {calibration.drift ? (
          <>
            <p className="mb-2 text-sm">
              Calibrated wavelength now minus under{" "}
              {previous ? (
                <Link href={`/calibrations/${previous.id}`} className="underline">
                  the calibration of {previous.calibratedOn}
                </Link>
              ) : (
                "the previous calibration"
              )}
              {previous ? ` (${previous.model}, RMS ${previous.rmsNm.toFixed(4)} nm)` : ""}: at most{" "}
              <span className="font-mono font-semibold">
                {calibration.drift.maxAbsNm.toFixed(3)} nm
              </span>
              .
            </p>
            <TableScroll label="Drift per pixel">
              <table className="text-sm">
                <caption className="sr-only">Drift per pixel</caption>
                <thead>
                  <tr>
                    <th scope="row" className="muted pr-3 text-left font-normal">
                      {xTitle}
                    </th>
                    {calibration.drift.pixels.map((px) => (
                      <th key={px} scope="col" className="px-3 text-right font-mono font-normal">
                        {px.toFixed(0)}
                      </th>
                    ))}
                  </tr>
                </thead>
                <tbody>
                  <tr>
                    <th scope="row" className="muted pr-3 text-left font-normal">
                      Δλ (nm)
                    </th>
                    {calibration.drift.deltaNm.map((d, i) => (
                      <td key={i} className="px-3 text-right font-mono">
                        {Math.abs(d) < 0.0005 ? "0.000" : (d > 0 ? "+" : "") + d.toFixed(3)}
                      </td>
                    ))}
                  </tr>
                </tbody>
              </table>
            </TableScroll>
          </>
        ) : (
          <p className="muted text-sm">
            None: this is the instrument&rsquo;s first calibration (or the previous one used another
            axis).
          </p>
        )}
      </section>
      <div className="mb-4 flex flex-col gap-4">
        <LampChart spectrum={series} pairs={pairs} xTitle={xTitle} />
        <ResidualChart pairs={pairs} xTitle={xTitle} />
      </div>
      <TableScroll label="Pairs of lamp peaks and lines" className="panel">
        <table className="w-full text-sm" data-testid="pairs-table">
          <caption className="px-3 py-2 text-left font-semibold">
            Pairs of lamp peaks and lines
          </caption>
          <thead className="border-b border-[var(--line)] text-left">
            <tr>
              <th scope="col" className="px-3 py-2 text-right">
                {xTitle}
              </th>
              <th scope="col" className="px-3 py-2 text-right">
                Line λ (nm)
              </th>
              <th scope="col" className="px-3 py-2 text-right">
                Residual (nm)
              </th>
              <th scope="col" className="px-3 py-2">
                Species
              </th>
              <th scope="col" className="px-3 py-2">
                In the fit
              </th>
            </tr>
          </thead>
          <tbody>
            {pairs.map((p) => (
              <tr
                key={`${p.pixel}-${p.wavelengthNm}`}
                className="border-b border-[var(--line)] last:border-0"
              >
                <td className="px-3 py-1.5 text-right font-mono">{p.pixel.toFixed(2)}</td>
                <td className="px-3 py-1.5 text-right font-mono">{p.wavelengthNm.toFixed(3)}</td>
                <td className="px-3 py-1.5 text-right font-mono">{p.residualNm.toFixed(4)}</td>
                <td className="px-3 py-1.5">{p.species ?? "—"}</td>
                <td className="px-3 py-1.5">
                  {p.used ? (
                    <span>
                      <span aria-hidden className="text-teal-700 dark:text-teal-300">
                        ▼{" "}
                      </span>
                      used
                      <OutsideCoveredNote pair={p} coveredRangeNm={calibration.coveredRangeNm} />
                    </span>
                  ) : (
                    <span>
                      <span aria-hidden className="text-red-700 dark:text-red-300">
                        ✕{" "}
                      </span>
                      rejected
                    </span>
                  )}
                </td>
              </tr>
            ))}
          </tbody>
        </table>
      </TableScroll>
      <EntityTrail entity="calibration" entityId={calibration.id} />
    </>
  );
}

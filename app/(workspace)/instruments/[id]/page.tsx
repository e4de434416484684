// One instrument: its settings, its export profile (how its files without a header are read), its
// calibration history (newest first, the default for new runs), its spectra (newest first, a lamp
// linking to its calibration) and the ways on: calibrate against a
// lamp, upload a spectrum, and for lab leads edit the instrument (and so its profile).
import Link from "next/link";
import { EmptyState } from "@/components/ui/empty-state";
import { PageHeader } from "@/components/ui/page-header";
import { X_TITLES, describeFirstColumn } from "@/components/uploads/first-column-labels";
import { idOrNotFound, orNotFound } from "@/lib/http/page-not-found";
import { can } from "@/lib/auth/policy";
import { fetchCalibrations } from "@/lib/services/calibrations";
import { fetchInstrument } from "@/lib/services/instruments";
import { fetchSpectra } from "@/lib/services/spectra";
import { requireWorkspace } from "@/lib/services/workspace";
import { TableScroll } from "@/components/ui/table-scroll";
import { isWavelengthUnit } from "@/lib/spectrum/types";

export const metadata = { title: "Instrument" };

const action =
  "rounded border border-[var(--line)] px-3 py-1.5 text-sm hover:bg-ink-100 dark:hover:bg-ink-800";

export default async function InstrumentPage({ params }: { params: Promise<{ id: string }> }) {
  const { actor } = await requireWorkspace();
  const id = idOrNotFound((await params).id);
  const [instrument, calibrations] = await Promise.all([
    orNotFound(fetchInstrument(actor, id)),
    orNotFound(fetchCalibrations(actor, id)),
  ]);
  const spectra = await fetchSpectra(actor, instrument.teamId, { instrumentId: id });
  const manager = can(actor, "instrument.manage", { teamId: instrument.teamId });
  return (
    <>
      <PageHeader
        title={instrument.name}
        description={`${instrument.dispersion === "prism" ? "Prism" : "Grating"} · ${instrument.pixels} pixels · nominal ${instrument.nominalMinNm}–${instrument.nominalMaxNm} nm · resolution ${instrument.resolutionNm} nm FWHM${instrument.detectorMax ? ` · detector maximum ${instrument.detectorMax} counts` : ""}${instrument.glass ? ` · glass ${instrument.glass}` : ""}${instrument.apexDeg ? ` · apex ${instrument.apexDeg}°` : ""}`}
        actions={
          <>
            {manager ? (
              <Link href={`/instruments/${id}/edit`} className={action}>
                Edit instrument
              </Link>
            ) : null}
            <Link href={`/instruments/${id}/upload?kind=lamp`} className={action}>
              Upload a spectrum
            </Link>
            <Link
              href={`/instruments/${id}/calibrate`}
              className="rounded bg-ember-600 px-3 py-1.5 text-sm font-medium text-white hover:bg-ember-700"
            >
              Calibrate
            </Link>
          </>
        }
      />
      <section
        aria-labelledby="export-profile-heading"
        className="mb-6 max-w-3xl text-sm"
        data-testid="export-profile"
      >
        <h2 id="export-profile-heading" className="mb-1 text-lg font-semibold">
          Export profile
        </h2>
        {instrument.exportXUnit ? (
          <p>
            Files without a header are read with their first column as{" "}
            <strong>{describeFirstColumn(instrument.exportXUnit, instrument.exportMedium)}</strong>
            {instrument.exportMedium === null && isWavelengthUnit(instrument.exportXUnit)
              ? " (air or vacuum not known)"
              : ""}
            .{" "}
            {manager ? (
              <Link href={`/instruments/${id}/edit`} className="underline">
                Change the profile
              </Link>
            ) : (
              <span className="muted">A lab lead can change it.</span>
            )}
          </p>
        ) : (
          <p>
            Not set yet: a file that does not say what its first column holds is read as pixels only
            when it has one row per pixel ({instrument.pixels.toLocaleString("en")}), else the
            upload page asks. The first upload whose header or uploader says it sets the profile.{" "}
            {manager ? (
              <Link href={`/instruments/${id}/edit`} className="underline">
                Set it now
              </Link>
            ) : null}
          </p>
        )}
      </section>
      <h2 className="mb-2 text-lg font-semibold">Calibration history</h2>
      {calibrations.length === 0 ? (
        <EmptyState title="Not calibrated yet">
          Upload a reference lamp spectrum (Hg, Ne, Ar, He, Na or a mix) recorded on this
          instrument, then calibrate: the lamp&apos;s peaks are paired with the line table&apos;s
          lamp lines and a dispersion relation is fitted.
        </EmptyState>
      ) : (
        <TableScroll label={`Calibrations of ${instrument.name}`} className="panel">
          <table className="w-full text-sm">
            <caption className="sr-only">Calibrations of {instrument.name}, newest first</caption>
            <thead className="border-b border-[var(--line)] text-left">
              <tr>
                <th scope="col" className="px-3 py-2">
                  Date
                </th>
                <th scope="col" className="px-3 py-2">
                  Model
                </th>
                <th scope="col" className="px-3 py-2 text-right">
                  RMS (nm)
                </th>
                <th scope="col" className="px-3 py-2 text-right">
                  Pairs used / rejected
                </th>
                <th scope="col" className="px-3 py-2 text-right">
                  Covered range (nm)
                </th>
                <th scope="col" className="px-3 py-2 text-right">
                  Drift from previous (max, nm)
                </th>
                <th scope="col" className="px-3 py-2">
                  Lamps
                </th>
              </tr>
            </thead>
            <tbody>
              {calibrations.map((c, index) => (
                <tr key={c.id} className="border-b border-[var(--line)] last:border-0">
                  <td className="px-3 py-2">
                    <Link href={`/calibrations/${c.id}`} className="underline">
                      {c.calibratedOn}
                    </Link>
                    <span className="muted block font-mono text-xs" data-testid="calibration-label">
                      {c.label}
                    </span>
                    {c.pairing.confirmation ? (
                      <span className="block text-xs">confirmed despite doubts</span>
                    ) : null}
                    {index === 0 ? (
                      <span className="ml-2 rounded border border-teal-700 px-1 text-2xs text-teal-800 dark:text-teal-200">
                        default for new runs
                      </span>
                    ) : null}
                  </td>
                  <td className="px-3 py-2 font-mono">{c.model}</td>
                  <td className="px-3 py-2 text-right font-mono">{c.rmsNm.toFixed(3)}</td>
                  <td className="px-3 py-2 text-right font-mono">
                    {c.pairs.length} / {c.rejected.length}
                  </td>
                  <td className="px-3 py-2 text-right font-mono">
                    {c.coveredRangeNm[0].toFixed(1)}–{c.coveredRangeNm[1].toFixed(1)}
                  </td>
                  <td className="px-3 py-2 text-right font-mono">
                    {c.drift ? c.drift.maxAbsNm.toFixed(3) : "— (first)"}
                  </td>
                  <td className="px-3 py-2">{c.lamps.join(", ")}</td>
                </tr>
              ))}
            </tbody>
          </table>
        </TableScroll>
      )}
      <h2 id="instrument-spectra" className="mb-2 mt-6 text-lg font-semibold">
        Spectra
      </h2>
      {spectra.length === 0 ? (
        <EmptyState title="No spectra yet">
          Nothing has been uploaded from this instrument.{" "}
          <Link href={`/instruments/${id}/upload?kind=lamp`} className="underline">
            Upload a lamp or sample spectrum
          </Link>
          .
        </EmptyState>
      ) : (
        <div className="panel overflow-x-auto">
          <table className="w-full text-sm" data-testid="instrument-spectra">
            <caption className="sr-only">
              Spectra uploaded from {instrument.name}, newest first
            </caption>
            <thead className="border-b border-[var(--line)] text-left">
              <tr>
                <th scope="col" className="px-3 py-2">
                  Uploaded (UTC)
                </th>
                <th scope="col" className="px-3 py-2">
                  Kind
                </th>
                <th scope="col" className="px-3 py-2">
                  Label and file
                </th>
                <th scope="col" className="px-3 py-2 text-right">
                  Points
                </th>
                <th scope="col" className="px-3 py-2">
                  First column
                </th>
                <th scope="col" className="px-3 py-2">
                  <span className="sr-only">Next step</span>
                </th>
              </tr>
            </thead>
            <tbody>
              {spectra.map((spectrum) => (
                <tr
                  key={spectrum.id}
                  className="border-b border-[var(--line)] last:border-0"
                  data-testid="instrument-spectrum"
                >
                  <td className="px-3 py-2 font-mono text-xs">
                    {spectrum.uploadedAt.slice(0, 16).replace("T", " ")}
                  </td>
                  <td className="px-3 py-2">{spectrum.kind}</td>
                  <td className="px-3 py-2">
                    {spectrum.label || <span className="muted">no label</span>}
                    <span className="muted block font-mono text-xs">{spectrum.fileName}</span>
                  </td>
                  <td className="px-3 py-2 text-right font-mono">
                    {spectrum.points.toLocaleString("en")}
                  </td>
                  <td className="px-3 py-2">{X_TITLES[spectrum.xUnit]}</td>
                  <td className="px-3 py-2">
                    {spectrum.kind === "lamp" ? (
                      <Link
                        href={`/instruments/${id}/calibrate?spectrum=${spectrum.id}`}
                        className="underline"
                      >
                        Calibrate with it
                      </Link>
                    ) : null}
                  </td>
                </tr>
              ))}
            </tbody>
          </table>
        </div>
      )}
    </>
  );
}

// Upload a lamp or sample file onto an instrument. The upload component first sends the file to the
// preview route (nothing stored) and shows its plot, facts and duplicate warning, and asks what the
// first column holds when nothing tells; once the chemist stores it, this page shows the stored
// spectrum as "Uploaded": its hash, points, range, a duplicate warning, the export profile the upload
// set (if it did) and a preview plot, with the next step.
import Link from "next/link";
import { PreviewChart } from "@/components/charts/spectrum-charts";
import { PageHeader } from "@/components/ui/page-header";
import { X_TITLES, describeFirstColumn } from "@/components/uploads/first-column-labels";
import { SpectrumUpload } from "@/components/uploads/spectrum-upload";
import { idOrNotFound, orNotFound } from "@/lib/http/page-not-found";
import { fetchSpectrumSeries } from "@/lib/services/run-spectrum";
import { fetchInstrument } from "@/lib/services/instruments";
import { fetchNotebooks } from "@/lib/services/notebooks";
import { fetchSpectrum } from "@/lib/services/spectra";
import { requireWorkspace } from "@/lib/services/workspace";
import { MAX_UPLOAD_BYTES, MAX_UPLOAD_POINTS } from "@/lib/validation/upload-schemas";

export const metadata = { title: "Upload a spectrum" };

const one = (value: string | string[] | undefined) =>
  typeof value === "string" ? value : undefined;
const primary =
  "rounded bg-ember-600 px-3 py-1.5 text-sm font-medium text-white hover:bg-ember-700";

export default async function UploadPage({
  params,
  searchParams,
}: {
  params: Promise<{ id: string }>;
  searchParams: Promise<Record<string, string | string[] | undefined>>;
}) {
  const { actor } = await requireWorkspace();
  const search = await searchParams;
  const id = idOrNotFound((await params).id);
  const instrument = await orNotFound(fetchInstrument(actor, id));
  const kind = one(search.kind) === "sample" ? "sample" : "lamp";
  const notebookId = one(search.notebook);
  const spectrumId = one(search.spectrum);
  const uploaded = spectrumId
    ? await orNotFound(fetchSpectrum(actor, idOrNotFound(spectrumId)))
    : null;
  const back = `/instruments/${id}/upload?kind={kind}${notebookId ? `&notebook=${notebookId}` : ""}`;
  const profile = instrument.exportXUnit
    ? describeFirstColumn(instrument.exportXUnit, instrument.exportMedium)
    : null;

  if (uploaded) {
    const series = await orNotFound(fetchSpectrumSeries(actor, uploaded.id));
    const notebooks =
      uploaded.kind === "sample" ? await fetchNotebooks(actor, instrument.teamId) : [];
    return (
      <>
        <PageHeader title="Uploaded" description={`${uploaded.fileName} on ${instrument.name}`} />
        <p
          role="status"
          className="mb-3 rounded border border-teal-700 bg-[var(--panel)] p-2 text-sm"
          data-testid="upload-status"
        >
          <span aria-hidden>✓ </span>Uploaded and stored as a {uploaded.kind} spectrum:{" "}
          {uploaded.points.toLocaleString("en")} points, {X_TITLES[uploaded.xUnit].toLowerCase()}{" "}
          {uploaded.xRange[0]}–{uploaded.xRange[1]}
          {uploaded.medium ? ` (${uploaded.medium})` : ""}.
        </p>
        {one(search.profileSet) === "1" && profile ? (
          <p
            role="status"
            className="mb-3 rounded border border-teal-700 bg-[var(--panel)] p-2 text-sm"
            data-testid="profile-set"
          >
            <span aria-hidden>✓ </span>
            {instrument.name} had no export profile; this upload set it. Files without a header are
            now read with their first column as <strong>{profile}</strong>.{" "}
            <Link href={`/instruments/${id}`} className="underline">
              See the instrument
            </Link>{" "}
            (a lab lead can change it there).
          </p>
        ) : null}
        {uploaded.duplicateOf ? (
          <p
            role="alert"
            className="mb-3 rounded border border-ember-600 bg-ember-50 p-2 text-sm text-ember-900 dark:bg-ink-800 dark:text-ember-100"
          >
            <span aria-hidden>⚠ </span>The same file (same SHA-256) was uploaded before as{" "}
            {uploaded.duplicateOf.fileName} on {uploaded.duplicateOf.uploadedAt.slice(0, 10)}. Both
            copies are kept.
          </p>
        ) : null}
        <dl className="mb-4 grid max-w-3xl grid-cols-[max-content_1fr] gap-x-4 gap-y-1 text-sm">
          <dt className="muted">Label</dt>
          <dd>{uploaded.label || "—"}</dd>
          <dt className="muted">Size</dt>
          <dd>{uploaded.byteSize.toLocaleString("en")} bytes, kept byte for byte</dd>
          <dt className="muted">SHA-256</dt>
          <dd className="break-all font-mono text-xs">{uploaded.sha256}</dd>
        </dl>
        <PreviewChart spectrum={series} xTitle={X_TITLES[uploaded.xUnit]} />
        <div className="mt-4 flex flex-wrap items-center gap-3 text-sm">
          {uploaded.kind === "lamp" ? (
            <Link href={`/instruments/${id}/calibrate?spectrum=${uploaded.id}`} className={primary}>
              Calibrate with this lamp
            </Link>
          ) : notebooks.length === 0 ? (
            <span>
              <Link href="/notebooks" className="underline">
                Open a notebook
              </Link>{" "}
              to start a run with this sample.
            </span>
          ) : (
            <>
              <span>Start a run with this sample in:</span>
              {(notebookId ? notebooks.filter((n) => n.id === notebookId) : notebooks)
                .slice(0, 5)
                .map((n) => (
                  <Link
                    key={n.id}
                    href={`/notebooks/${n.id}?spectrum=${uploaded.id}`}
                    className={primary}
                  >
                    {n.title}
                  </Link>
                ))}
            </>
          )}
          <Link href={back.replace("{kind}", uploaded.kind)} className="underline">
            Upload another file
          </Link>
        </div>
      </>
    );
  }

  return (
    <>
      <PageHeader
        title="Upload a spectrum"
        description={`Onto ${instrument.name}: a reference lamp to calibrate, or a sample to identify.`}
      />
      <div className="muted mb-4 flex max-w-prose flex-col gap-2 text-sm" data-testid="upload-help">
        <p>
          Two-column text (separated by commas, tabs, semicolons or spaces; comma or point decimals)
          or JCAMP-DX. The first column holds pixel indices, wavelengths in nm or Å, or wavenumbers
          in cm⁻¹; a header such as &ldquo;wavelength (nm, air)&rdquo; or &ldquo;pixel&rdquo; says
          which. Limits: {MAX_UPLOAD_BYTES / (1024 * 1024)} MiB per file and{" "}
          {MAX_UPLOAD_POINTS.toLocaleString("en")} points.
        </p>
        <p data-testid="upload-profile">
          A file without such a header is read{" "}
          {profile ? (
            <>
              through {instrument.name}&apos;s export profile, as <strong>{profile}</strong>
            </>
          ) : (
            <>
              as pixels when it has one row per detector pixel (
              {instrument.pixels.toLocaleString("en")}); otherwise you are asked what its first
              column holds, and since {instrument.name} has no export profile yet, your answer
              becomes it
            </>
          )}
          .
        </p>
        <p>
          You see a preview of the parsed points before anything is stored; the file is then stored
          as it was sent, byte for byte with its SHA-256. A file that cannot be read is refused with
          the place of the problem and nothing is stored.
        </p>
      </div>
      <SpectrumUpload
        instrumentId={id}
        instrumentName={instrument.name}
        pixels={instrument.pixels}
        exportProfile={
          instrument.exportXUnit
            ? { exportXUnit: instrument.exportXUnit, exportMedium: instrument.exportMedium }
            : null
        }
        defaultKind={kind}
        maxBytes={MAX_UPLOAD_BYTES}
        xTitles={X_TITLES}
        afterUploadHref={`/instruments/${id}/upload?kind={kind}&spectrum={id}${notebookId ? `&notebook=${notebookId}` : ""}`}
      />
    </>
  );
}

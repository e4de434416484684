// The "Downloads" block of a run page: the PDF report, the peaks CSV, the spectrum as JCAMP-DX (as
// calibrated and on even steps) and the printable page. Each file is a button that says while it is
// prepared (the PDF takes several seconds) and when it is saved, or why it failed.
import Link from "next/link";
import { DownloadButton } from "@/components/ui/download-button";

const LINK =
  "inline-flex items-center gap-1 rounded border border-[var(--line)] bg-[var(--panel)] px-3 py-1.5 text-sm hover:bg-ink-100 dark:hover:bg-ink-800";

export function RunDownloads({ runId }: { runId: string }) {
  return (
    <section className="mt-6" aria-labelledby="run-downloads" data-testid="run-downloads">
      <h2 id="run-downloads" className="mb-2 text-lg font-semibold">
        Downloads
      </h2>
      <ul className="flex flex-wrap items-start gap-2">
        <li>
          <DownloadButton
            href={`/api/runs/${runId}/report.pdf`}
            label="Report (PDF)"
            what="PDF"
            fallbackName="emberline-run-report.pdf"
            testId="download-report-pdf"
          />
        </li>
        <li>
          <DownloadButton
            href={`/api/runs/${runId}/peaks.csv`}
            label="Peaks and matches (CSV)"
            what="peaks CSV"
            fallbackName="emberline-run-peaks.csv"
            testId="download-peaks-csv"
          />
        </li>
        <li>
          <DownloadButton
            href={`/api/runs/${runId}/spectrum.jdx`}
            label="Calibrated spectrum (JCAMP-DX)"
            what="JCAMP-DX file"
            fallbackName="emberline-run-spectrum.jdx"
            testId="download-spectrum-jdx"
          />
        </li>
        <li>
          <DownloadButton
            href={`/api/runs/${runId}/spectrum-even.jdx`}
            label="Spectrum on even steps (JCAMP-DX)"
            what="even-step JCAMP-DX file"
            fallbackName="emberline-run-spectrum-even.jdx"
            testId="download-spectrum-even-jdx"
            describedBy="run-downloads-even-note"
          />
        </li>
        <li>
          <Link href={`/runs/${runId}/report`} className={LINK} data-testid="printable-report">
            Printable page
          </Link>
        </li>
      </ul>
      <p className="muted mt-1 text-xs">
        The report and the files carry the screening caveat: they are not a certified analysis.
      </p>
      <p id="run-downloads-even-note" className="muted mt-1 text-xs">
        The even-step spectrum is the calibrated one interpolated onto evenly spaced wavelengths,
        for programs that read only those; a narrow peak loses a little height in it.
      </p>
    </section>
  );
}

// The "Downloads" block of a run page: the PDF report, the peaks CSV, the spectrum as JCAMP-DX (as
// calibrated and on even steps) and the printable page. Plain links: the browser downloads the files
// with the session cookie.
import Link from "next/link";

const LINK =
  "inline-flex items-center gap-1 rounded border border-[var(--line)] bg-[var(--panel)] px-3 py-1.5 text-sm hover:bg-ink-100 dark:hover:bg-ink-800";

export function RunDownloads({ runId }: { runId: string }) {
  return (
    <section className="mt-6" aria-labelledby="run-downloads" data-testid="run-downloads">
      <h2 id="run-downloads" className="mb-2 text-lg font-semibold">
        Downloads
      </h2>
      <ul className="flex flex-wrap gap-2">
        <li>
          <a
            href={`/api/runs/${runId}/report.pdf`}
            download
            className={LINK}
            data-testid="download-report-pdf"
          >
            Report (PDF)
          </a>
        </li>
        <li>
          <a
            href={`/api/runs/${runId}/peaks.csv`}
            download
            className={LINK}
            data-testid="download-peaks-csv"
          >
            Peaks and matches (CSV)
          </a>
        </li>
        <li>
          <a
            href={`/api/runs/${runId}/spectrum.jdx`}
            download
            className={LINK}
            data-testid="download-spectrum-jdx"
          >
            Calibrated spectrum (JCAMP-DX)
          </a>
        </li>
        <li>
          <a
            href={`/api/runs/${runId}/spectrum-even.jdx`}
            download
            className={LINK}
            data-testid="download-spectrum-even-jdx"
            aria-describedby="run-downloads-even-note"
          >
            Spectrum on even steps (JCAMP-DX)
          </a>
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

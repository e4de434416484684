// A run's printable report: the same content as the PDF, with print styles for A4 that leave out
// the workspace navigation, and the PDF one click away.
import { DownloadButton } from "@/components/ui/download-button";
import Link from "next/link";
import { PrintButton } from "@/components/reports/print-button";
import {
  REPORT_CHART_SIZE,
  RunReportView,
  reportPrintCss,
} from "@/components/reports/run-report-view";
import { idOrNotFound, orNotFound } from "@/lib/http/page-not-found";
import { chartGeometry, chartLabelsFromCalls } from "@/lib/reports/chart-geometry";
import { fetchRunReport } from "@/lib/services/run-reports";
import { requireWorkspace } from "@/lib/services/workspace";

export const metadata = { title: "Run report" };

export default async function RunReportPage({ params }: { params: Promise<{ id: string }> }) {
  const { actor } = await requireWorkspace();
  const id = idOrNotFound((await params).id);
  const { report, chart } = await orNotFound(fetchRunReport(actor, id));
  const geometry = chartGeometry(
    chart.wavelengthNm,
    chart.counts,
    chartLabelsFromCalls(report.calls),
    { ...REPORT_CHART_SIZE, fontSize: 7 },
  );
  return (
    <>
      <style>{reportPrintCss(report)}</style>
      <div className="report-toolbar mx-auto mb-4 flex max-w-[210mm] flex-wrap items-center gap-2">
        <Link
          href={`/runs/${id}`}
          className="rounded border border-[var(--line)] px-3 py-1.5 text-sm hover:bg-ink-100 dark:hover:bg-ink-800"
        >
          Back to the run
        </Link>
        <PrintButton />
        <DownloadButton
          href={`/api/runs/${id}/report.pdf`}
          label="Download the PDF"
          what="PDF"
          fallbackName="emberline-run-report.pdf"
          testId="report-page-pdf"
        />
        <p className="muted text-xs">Printing leaves out the navigation and fits A4.</p>
      </div>
      <div className="panel mx-auto max-w-[210mm] p-6 print:border-0 print:p-0">
        <RunReportView report={report} chart={geometry} />
      </div>
    </>
  );
}

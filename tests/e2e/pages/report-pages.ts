// Page objects of the reports: a run's printable report and the run page's Downloads block (buttons
// with a status line each).
import fs from "node:fs";
import type { Download, Page } from "playwright-core";

export class PrintableReportPage {
  constructor(private readonly page: Page) {}

  async goto(runId: string): Promise<void> {
    await this.page.goto(`/runs/${runId}/report`);
    await this.page.getByTestId("run-report").waitFor();
  }

  get report() {
    return this.page.getByTestId("run-report");
  }

  get chart() {
    return this.page.getByTestId("report-chart");
  }
}

type DownloadTestId =
  | "download-report-pdf"
  | "download-peaks-csv"
  | "download-spectrum-jdx"
  | "download-spectrum-even-jdx";

export class RunDownloadsBlock {
  constructor(private readonly page: Page) {}

  /** The `aria-live` line under a download button: preparing, ready or why it failed. */
  status(testId: DownloadTestId) {
    return this.page.getByTestId(`${testId}-status`);
  }

  button(testId: DownloadTestId) {
    return this.page.getByTestId(testId);
  }

  /** Clicks a download button of the run page and returns the downloaded bytes and the suggested name. */
  async download(testId: DownloadTestId): Promise<{ name: string; bytes: Buffer }> {
    const [download]: [Download, void] = await Promise.all([
      this.page.waitForEvent("download"),
      this.page.getByTestId(testId).click(),
    ]);
    const file = await download.path();
    return { name: download.suggestedFilename(), bytes: fs.readFileSync(file) };
  }
}

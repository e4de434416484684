// Page objects of the reports: a run's printable report and the run page's Downloads block.
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

export class RunDownloadsBlock {
  constructor(private readonly page: Page) {}

  /** Clicks a download link of the run page and returns the downloaded bytes and the suggested name. */
  async download(
    testId:
      | "download-report-pdf"
      | "download-peaks-csv"
      | "download-spectrum-jdx"
      | "download-spectrum-even-jdx",
  ): Promise<{ name: string; bytes: Buffer }> {
    const [download]: [Download, void] = await Promise.all([
      this.page.waitForEvent("download"),
      this.page.getByTestId(testId).click(),
    ]);
    const file = await download.path();
    return { name: download.suggestedFilename(), bytes: fs.readFileSync(file) };
  }
}

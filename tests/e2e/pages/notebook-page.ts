// Page object of one notebook: its run filters, the run form's sample picker and the rename form.
import type { Locator, Page } from "playwright-core";

export class NotebookPage {
  readonly rows: Locator;
  readonly count: Locator;
  readonly heading: Locator;

  constructor(private readonly page: Page) {
    this.rows = page.getByTestId("run-row");
    this.count = page.getByTestId("runs-count");
    this.heading = page.getByRole("heading", { level: 1 });
  }

  /** Starts a run on a sample picked by its label; resolves on the run's page. */
  async startRun(instrument: string, sampleLabel: string, source: string): Promise<void> {
    await this.page
      .getByLabel("Instrument", { exact: true })
      .last()
      .selectOption({ label: instrument });
    const picker = this.page.getByLabel("Sample spectrum");
    const option = picker.locator("option", { hasText: sampleLabel }).first();
    await option.waitFor({ state: "attached" });
    await picker.selectOption((await option.getAttribute("value"))!);
    await this.page.getByLabel("Kind of source").selectOption(source);
    await this.page.getByRole("button", { name: "Start the run" }).click();
    await this.page.waitForURL(/\/runs\/[0-9a-f-]{36}$/, { timeout: 60_000 });
  }

  /** Waits until the table shows `n` runs and the list is not refreshing. */
  async waitForRuns(n: number): Promise<void> {
    await this.page.waitForFunction(
      (expected) =>
        document.querySelectorAll("[data-testid=run-row]").length === expected &&
        /shown$/.test(document.querySelector("[data-testid=runs-count]")?.textContent ?? ""),
      n,
      { timeout: 15_000 },
    );
  }

  async rename(title: string): Promise<void> {
    const field = this.page.getByLabel("New title");
    // The form folds away under its summary; it stays open after a rename to show the outcome.
    if (!(await field.isVisible()))
      await this.page.getByText("Rename the notebook", { exact: true }).click();
    await field.fill(title);
    await this.page.getByRole("button", { name: "Rename", exact: true }).click();
  }
}

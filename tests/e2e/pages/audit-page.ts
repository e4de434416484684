// Page object of /audit: the filter form, the table of events, a row's before and after, paging
// and the CSV download.
import type { Download, Locator, Page } from "playwright-core";

export class AuditTrailPage {
  readonly heading: Locator;
  readonly filters: Locator;
  readonly table: Locator;
  readonly rows: Locator;
  readonly loadMore: Locator;
  readonly download: Locator;
  readonly status: Locator;

  constructor(private readonly page: Page) {
    this.heading = page.getByRole("heading", { level: 1, name: "Audit trail" });
    this.filters = page.getByRole("search", { name: "Filter the audit trail" });
    this.table = page.getByTestId("audit-table");
    this.rows = page.getByTestId("audit-row");
    this.loadMore = page.getByRole("button", { name: "Load more" });
    this.download = page.getByRole("button", { name: /^Download CSV/ });
    this.status = page.getByRole("main").getByRole("status");
  }

  async goto(query = ""): Promise<void> {
    await this.page.goto(`/audit${query}`);
    await this.heading.waitFor();
  }

  /** Types an action into its field from the keyboard and submits with Enter. */
  async filterByAction(action: string): Promise<void> {
    const field = this.filters.getByLabel("Action");
    await field.click();
    await field.fill("");
    await this.page.keyboard.type(action);
    await this.page.keyboard.press("Enter");
    await this.page.waitForURL((url) => url.searchParams.get("action") === action);
    await this.heading.waitFor();
  }

  /** Opens a row's before and after with the keyboard; returns the details table. */
  async expand(row: Locator): Promise<Locator> {
    const toggle = row.getByRole("button", { name: /^Show/ });
    const id = await toggle.getAttribute("aria-controls");
    await toggle.focus();
    await this.page.keyboard.press("Enter");
    await row.getByRole("button", { name: /^Hide/, expanded: true }).waitFor();
    const details = this.page.locator(`[id="${id}"]`);
    await details.getByTestId("before-after").waitFor();
    return details;
  }

  async downloadCsv(): Promise<Download> {
    const [download] = await Promise.all([
      this.page.waitForEvent("download"),
      this.download.click(),
    ]);
    return download;
  }
}

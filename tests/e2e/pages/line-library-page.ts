// Page objects of the line library: the browse table with its filters, and the lab lead's draft
// (CSV import with its preview, apply, publish).
import type { Locator, Page } from "playwright-core";

export class LineLibraryPage {
  readonly heading: Locator;
  readonly releasePicker: Locator;
  readonly table: Locator;
  readonly rows: Locator;
  readonly shownRelease: Locator;
  readonly status: Locator;

  constructor(private readonly page: Page) {
    this.heading = page.getByRole("heading", { level: 1, name: "Line library" });
    this.releasePicker = page.getByLabel("Release", { exact: true });
    this.table = page.getByTestId("line-table");
    this.rows = this.table.locator("tbody tr");
    this.shownRelease = page.getByTestId("shown-release");
    this.status = page.locator("main [role=status]");
  }

  async goto(query = ""): Promise<void> {
    await this.page.goto(`/lines${query}`);
    await this.heading.waitFor();
  }

  /** The releases the picker offers, as their option texts. */
  async releaseOptions(): Promise<string[]> {
    return (await this.releasePicker.locator("option").allTextContents()).map((t) => t.trim());
  }

  async selectedRelease(): Promise<string> {
    return ((await this.releasePicker.locator("option:checked").textContent()) ?? "").trim();
  }

  /** Fills the GET filter form and submits it; waits for the new URL. */
  async filter(values: {
    element?: string;
    species?: string;
    minNm?: string;
    maxNm?: string;
  }): Promise<void> {
    const form = this.page.getByRole("search", { name: "Filter lines" });
    if (values.species !== undefined) await form.getByLabel("Species").fill(values.species);
    if (values.element !== undefined) await form.getByLabel("Element").fill(values.element);
    if (values.minNm !== undefined) await form.getByLabel("From nm").fill(values.minNm);
    if (values.maxNm !== undefined) await form.getByLabel("To nm").fill(values.maxNm);
    await Promise.all([
      this.page.waitForURL((url) => url.pathname === "/lines" && url.search.length > 0),
      form.getByRole("button", { name: "Show lines" }).click(),
    ]);
    await this.heading.waitFor();
  }

  /** Opens the draft from the browse page, whichever of the two buttons the lead is offered. */
  async openDraft(): Promise<void> {
    const entry = this.page.getByRole("main").getByRole("button", { name: "Open the draft" });
    const onward = this.page.getByRole("link", { name: "Continue the draft" });
    await entry.or(onward).first().click();
    await this.page.waitForURL((url) => url.pathname === "/lines/draft");
  }
}

export class LineDraftPage {
  readonly heading: Locator;
  readonly fileInput: Locator;
  readonly previewButton: Locator;
  readonly preview: Locator;
  readonly previewAdds: Locator;
  readonly previewChanges: Locator;
  readonly previewErrors: Locator;
  readonly applyButton: Locator;
  readonly notes: Locator;

  constructor(private readonly page: Page) {
    this.heading = page.getByRole("heading", { level: 1, name: "Draft of the line table" });
    this.fileInput = page.getByLabel("CSV file");
    this.previewButton = page.getByRole("button", { name: "Preview the import" });
    this.preview = page.getByTestId("import-preview");
    this.previewAdds = page.getByTestId("preview-adds").locator("tbody tr");
    this.previewChanges = page.getByTestId("preview-changes").locator("ul > li");
    this.previewErrors = page.getByTestId("preview-errors").locator("tbody tr");
    this.applyButton = page.getByRole("button", { name: "Apply these changes" });
    this.notes = page.getByLabel("Release notes");
  }

  async waitUntilShown(): Promise<void> {
    await this.heading.waitFor();
  }

  /** Chooses a CSV file (made in memory) and asks for the preview. */
  async previewImport(fileName: string, csv: string): Promise<void> {
    await this.fileInput.setInputFiles({
      name: fileName,
      mimeType: "text/csv",
      buffer: Buffer.from(csv, "utf8"),
    });
    await this.previewButton.click();
    await this.preview.waitFor();
  }

  /** Applies the previewed import; fails with the page's own message when the server refuses. */
  async apply(): Promise<void> {
    await this.applyButton.click();
    const applied = this.page.getByRole("status").filter({ hasText: "Applied:" });
    const refused = this.page.locator("form [role=alert]").filter({ hasText: /./ });
    await applied.or(refused).first().waitFor();
    if (await refused.count())
      throw new Error(`The import was refused: ${await refused.first().textContent()}`);
  }

  /** The question asked before publishing. */
  get publishDialog() {
    return this.page.getByRole("dialog", { name: /^Publish release \d+\?$/ });
  }

  /**
   * Publishes with notes, confirming in the dialog; resolves with the release number the button
   * announced. With `cancelFirst`, the dialog is first cancelled with Escape and must leave the draft.
   */
  async publish(notes: string, { cancelFirst = false } = {}): Promise<number> {
    await this.notes.fill(notes);
    const button = this.page.getByRole("button", { name: /^Publish as release \d+$/ });
    const number = Number((await button.textContent())?.match(/\d+/)?.[0]);
    if (cancelFirst) {
      await button.click();
      await this.publishDialog.waitFor();
      await this.page.keyboard.press("Escape");
      await this.publishDialog.waitFor({ state: "hidden" });
    }
    await button.click();
    await this.publishDialog.waitFor();
    await Promise.all([
      this.page.waitForURL((url) => url.pathname === "/lines"),
      this.publishDialog.getByRole("button", { name: `Publish release ${number}` }).click(),
    ]);
    return number;
  }
}

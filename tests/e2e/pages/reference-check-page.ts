// Page object of the lab lead's reference check: choose a file and its medium, read the comparison,
// decide disagreements, confirm.
import type { Locator, Page } from "playwright-core";

export class ReferenceCheckPage {
  readonly heading: Locator;
  readonly fileInput: Locator;
  readonly medium: Locator;
  readonly checkButton: Locator;
  readonly preview: Locator;
  readonly agreeing: Locator;
  readonly alreadyVerified: Locator;
  readonly disagreeing: Locator;
  readonly referenceOnly: Locator;
  readonly confirmButton: Locator;
  readonly reason: Locator;
  readonly error: Locator;

  constructor(private readonly page: Page) {
    this.heading = page.getByRole("heading", {
      level: 1,
      name: "Check the draft against a reference",
    });
    this.fileInput = page.getByLabel("Reference CSV file");
    this.medium = page.getByLabel("Medium of the wavelengths");
    this.checkButton = page.getByRole("button", { name: "Check the draft against this file" });
    this.preview = page.getByTestId("reference-preview");
    this.agreeing = page.getByTestId("reference-agreeing").locator("tbody tr");
    this.alreadyVerified = page.getByTestId("reference-already-verified").locator("tbody tr");
    this.disagreeing = page.getByTestId("reference-disagreeing").locator("tbody tr");
    this.referenceOnly = page.getByTestId("reference-only").locator("li");
    this.confirmButton = page.getByRole("button", { name: /^Mark \d+ rows? verified with / });
    this.reason = page.getByLabel("Reason for the audit trail");
    this.error = page.locator("form [role=alert]").filter({ hasText: /./ });
  }

  async waitUntilShown(): Promise<void> {
    await this.heading.waitFor();
  }

  /**
   * Chooses a reference file (made in memory), optionally its medium, and asks for the comparison;
   * waits for the preview, or with `expect: "refusal"` for the form's error.
   */
  async check(
    fileName: string,
    csv: string,
    medium: "" | "air" | "vacuum" = "",
    { expect = "preview" }: { expect?: "preview" | "refusal" } = {},
  ): Promise<void> {
    await this.fileInput.setInputFiles({
      name: fileName,
      mimeType: "text/csv",
      buffer: Buffer.from(csv, "utf8"),
    });
    await this.medium.selectOption(medium);
    await this.checkButton.click();
    if (expect === "refusal") {
      await this.error.first().waitFor();
      return;
    }
    // An earlier refusal stays on screen until the answer comes: wait for the preview itself.
    await this.preview.waitFor();
  }

  /** Chooses a decision for the disagreeing row whose text contains `rowText`. */
  async decide(rowText: string, decision: "Leave" | "Keep ours" | "Take the reference value") {
    const row = this.disagreeing.filter({ hasText: rowText });
    await row.getByLabel(decision, { exact: true }).check();
  }
}

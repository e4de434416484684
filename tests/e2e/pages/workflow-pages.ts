// Page objects of the chemist's workflow: instruments, the upload zone, calibrating, notebooks and runs.
import type { Locator, Page } from "playwright-core";

export class InstrumentsPage {
  constructor(private readonly page: Page) {}

  async goto(): Promise<void> {
    await this.page.goto("/instruments");
    await this.page.getByRole("heading", { level: 1, name: "Instruments" }).waitFor();
  }

  /** The lab lead's form; resolves on the new instrument's page. */
  async create(fields: {
    name: string;
    pixels: number;
    fromNm: number;
    toNm: number;
    resolutionNm: number;
    /** The export profile's selects, by their option labels; left out, the profile stays unset. */
    firstColumn?: string;
    medium?: string;
  }): Promise<string> {
    await this.page.getByLabel("Name").fill(fields.name);
    await this.page.getByLabel("Dispersion").selectOption("grating");
    await this.page.getByLabel("Pixels").fill(String(fields.pixels));
    await this.page.getByLabel("Resolution, FWHM (nm)").fill(String(fields.resolutionNm));
    await this.page.getByLabel("Nominal range from (nm)").fill(String(fields.fromNm));
    await this.page.getByLabel("Nominal range to (nm)").fill(String(fields.toNm));
    if (fields.firstColumn) {
      await this.page
        .getByLabel("First column of its files")
        .selectOption({ label: fields.firstColumn });
    }
    if (fields.medium) {
      await this.page.getByLabel("Wavelengths measured").selectOption({ label: fields.medium });
    }
    await this.page.getByRole("button", { name: "Add the instrument" }).click();
    await this.page.waitForURL(/\/instruments\/[0-9a-f-]{36}$/);
    return new URL(this.page.url()).pathname.split("/").pop()!;
  }
}

export class UploadZone {
  readonly zone: Locator;
  readonly input: Locator;
  readonly preview: Locator;
  readonly status: Locator;

  constructor(private readonly page: Page) {
    this.zone = page.getByTestId("dropzone");
    this.input = this.zone.locator("input[type=file]");
    this.preview = page.getByTestId("upload-preview");
    this.status = page.getByTestId("upload-status");
  }

  /**
   * Drops a file on the zone the way a browser does: a drop event carrying a DataTransfer with the file.
   * It waits for the page's scripts first: a drop on the server-rendered zone before React has attached
   * its handlers is lost.
   */
  async drop(fileName: string, text: string): Promise<void> {
    await this.page.waitForLoadState("networkidle");
    const dataTransfer = await this.page.evaluateHandle(
      ({ name, content }) => {
        const transfer = new DataTransfer();
        transfer.items.add(new File([content], name, { type: "text/csv" }));
        return transfer;
      },
      { name: fileName, content: text },
    );
    await this.zone.dispatchEvent("dragenter", { dataTransfer });
    await this.zone.dispatchEvent("drop", { dataTransfer });
  }

  async choose(fileName: string, text: string): Promise<void> {
    await this.input.setInputFiles({
      name: fileName,
      mimeType: "text/csv",
      buffer: Buffer.from(text),
    });
  }

  /** Sets the kind and the label (they keep their values through the preview). */
  async describe(kind: "lamp" | "sample", label: string): Promise<void> {
    await this.page
      .getByRole("radio", { name: kind === "lamp" ? /Reference lamp/ : /Sample/ })
      .check();
    await this.page.getByLabel("Label (optional)").fill(label);
  }

  /** Waits for the preview the server sends back for a dropped or chosen file (nothing stored yet). */
  async awaitPreview(): Promise<void> {
    await this.preview.waitFor({ timeout: 30_000 });
  }

  /** Stores the previewed file; resolves on the "Uploaded" state. */
  async store(): Promise<void> {
    await this.preview.getByRole("button", { name: "Store this spectrum" }).click();
    await this.status.waitFor({ timeout: 30_000 });
  }

  /** The question the page asks when nothing tells what the file's first column holds. */
  get question(): Locator {
    return this.page.getByTestId("first-column-question");
  }

  /** Answers the question with the selects' option labels and sends the file again for its preview. */
  async answerFirstColumn(firstColumn: string, medium?: string): Promise<void> {
    await this.question.getByLabel("First column").selectOption({ label: firstColumn });
    if (medium)
      await this.question.getByLabel("Wavelengths measured").selectOption({ label: medium });
    await this.question.getByRole("button", { name: "Read the file this way" }).click();
  }

  /** After dropping or choosing a file: kind and label, the preview, then store. */
  async upload(kind: "lamp" | "sample", label: string): Promise<void> {
    await this.describe(kind, label);
    await this.awaitPreview();
    await this.store();
  }
}

/**
 * Waits until Plotly has drawn every chart on the page; when it never does, the error says what the
 * charts show instead (skeletons still loading, or the sentence of a library that did not arrive).
 */
export async function chartsDrawn(page: Page): Promise<void> {
  const chart = "[data-testid=chart]";
  try {
    await page.waitForFunction(
      (selector) => {
        const figures = document.querySelectorAll(selector);
        return figures.length > 0 && [...figures].every((f) => f.querySelector(".main-svg"));
      },
      chart,
      { timeout: 30_000 },
    );
  } catch (error) {
    const seen = await page
      .evaluate(
        (selector) =>
          [...document.querySelectorAll(selector)].map((f) =>
            f.querySelector(".main-svg")
              ? "drawn"
              : (f.querySelector("[data-testid=chart-error]")?.textContent ??
                f.querySelector("[data-testid=chart-skeleton]")?.textContent ??
                "empty"),
          ),
        chart,
      )
      .catch(() => ["(the page could not be read)"]);
    throw new Error(`The charts were not all drawn in 30 s: ${JSON.stringify(seen)}`, {
      cause: error,
    });
  }
}

export class RunPage {
  readonly calls: Locator;

  constructor(private readonly page: Page) {
    this.calls = page.getByTestId("call");
  }

  /** The verdict shown beside a species (its text, not its colour). */
  async verdictOf(species: string): Promise<string | null> {
    const call = this.calls.filter({
      has: this.page.getByTestId("call-species").getByText(species, { exact: true }),
    });
    if ((await call.count()) === 0) return null;
    const text = (await call.first().locator("summary").textContent()) ?? "";
    return /present|possible|absent/.exec(text)?.[0] ?? null;
  }

  /** The species labels Plotly drew on the chart. */
  async chartLabels(): Promise<string[]> {
    return this.page.locator("[data-testid=chart] .textpoint text").allTextContents();
  }
}

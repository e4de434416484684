// Starts Debian's Chromium through playwright-core with a fresh profile, and keeps screenshots
// under test-output/e2e/ (git-ignored).
import fs from "node:fs";
import os from "node:os";
import path from "node:path";
import { randomInt } from "node:crypto";
import { chromium, type BrowserContext, type Page } from "playwright-core";

export const APP_URL = (process.env.EMBERLINE_TEST_URL ?? "http://127.0.0.1:3100").replace(
  /\/$/,
  "",
);
export const SCREENSHOT_DIR = path.resolve(process.cwd(), "test-output/e2e");

export interface Session {
  context: BrowserContext;
  page: Page;
  /** Uncaught page errors and console errors seen since the page opened. */
  problems: string[];
  close(): Promise<void>;
}

/** What a test may change about the browser: a phone's screen and touch (the layout tests). */
export interface BrowserOptions {
  viewport?: { width: number; height: number };
  /** Touch events and a coarse pointer, as on a phone or tablet. */
  hasTouch?: boolean;
  /** Honours the page's meta viewport, as a phone's browser does. */
  isMobile?: boolean;
}

/**
 * A headless Chromium with its own fresh profile. Playwright refuses `--user-data-dir` in
 * `args` and takes the folder as launchPersistentContext's first argument instead.
 */
export async function openBrowser(options: BrowserOptions = {}): Promise<Session> {
  const userDataDir = fs.mkdtempSync(path.join(os.tmpdir(), "emberline-e2e-"));
  const context = await chromium.launchPersistentContext(userDataDir, {
    executablePath: "/usr/bin/chromium",
    headless: true,
    args: [
      "--no-sandbox",
      "--disable-gpu",
      "--disable-background-networking",
      "--disable-component-update",
      "--no-first-run",
      "--disable-sync",
    ],
    viewport: options.viewport ?? { width: 1280, height: 800 },
    hasTouch: options.hasTouch ?? false,
    isMobile: options.isMobile ?? false,
    baseURL: APP_URL,
    // The app throttles failed sign-ins per client address; this file gets its own (a header only).
    extraHTTPHeaders: {
      "x-forwarded-for": `10.${randomInt(0, 256)}.${randomInt(0, 256)}.${randomInt(1, 255)}`,
    },
  });
  const page = context.pages()[0] ?? (await context.newPage());
  const problems: string[] = [];
  page.on("pageerror", (error) => problems.push(`pageerror: ${error.message}`));
  // Failed loads are recorded with their URL from the response; Chromium's console line for the
  // same failure has no URL, so it is left out here.
  page.on("console", (message) => {
    if (message.type() === "error" && !message.text().startsWith("Failed to load resource")) {
      problems.push(`console: ${message.text()}`);
    }
  });
  page.on("response", (response) => {
    const url = new URL(response.url());
    // The app has no favicon yet (reported); Chromium asks for one on the first visit of a profile.
    if (url.pathname === "/favicon.ico") return;
    if (response.status() >= 400)
      problems.push(`HTTP ${response.status()} ${url.pathname}${url.search}`);
  });
  return {
    context,
    page,
    problems,
    async close() {
      await context.close();
      fs.rmSync(userDataDir, { recursive: true, force: true });
    },
  };
}

export async function screenshot(page: Page, name: string): Promise<string> {
  fs.mkdirSync(SCREENSHOT_DIR, { recursive: true });
  const file = path.join(SCREENSHOT_DIR, `${name}.png`);
  await page.screenshot({ path: file, fullPage: true });
  return file;
}

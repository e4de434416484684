// Each demo role signs in through the form, sees its own navigation, opens every area without
// an error, and signs out back to the sign-in page. Screenshots go to test-output/e2e/.
import { afterAll, beforeAll, beforeEach, describe, expect, it } from "vitest";
import { openBrowser, screenshot, type Session } from "./support/browser";
import { SignInPage } from "./pages/sign-in-page";
import { WorkspaceShell } from "./pages/workspace-shell";

const DEMO_PASSWORD = "emberline-demo";

const ROLES = [
  {
    role: "chemist",
    email: "chem@demo.emberline.example",
    name: "Mara Quist",
    nav: ["Home", "Notebooks", "Instruments", "Line library", "Audit trail", "Team", "Account"],
  },
  {
    role: "supervisor",
    email: "super@demo.emberline.example",
    name: "Tobias Wren",
    nav: [
      "Home",
      "Notebooks",
      "Instruments",
      "Line library",
      "Review",
      "Audit trail",
      "Team",
      "Account",
    ],
  },
  {
    // The lead opens in Flame Screening, the team where they hold their widest role (lab lead);
    // the switch to Arc and Spark Bench, where they are a supervisor, is checked below.
    role: "lab-lead",
    email: "lead@demo.emberline.example",
    name: "Ilse Varga",
    nav: [
      "Home",
      "Notebooks",
      "Instruments",
      "Line library",
      "Audit trail",
      "Team",
      "Outgoing mail",
      "Account",
    ],
  },
] as const;

const slug = (label: string) => label.toLowerCase().replace(/[^a-z0-9]+/g, "-");

let browser: Session;

beforeAll(async () => {
  browser = await openBrowser();
});

afterAll(async () => {
  await browser?.close();
});

beforeEach(async () => {
  await browser.context.clearCookies();
  browser.problems.length = 0;
});

describe.each(ROLES)("the $role", ({ role, email, name, nav }) => {
  it("signs in with the keyboard, sees its navigation, opens every area and signs out", async () => {
    const { page } = browser;
    const signInPage = new SignInPage(page);
    const shell = new WorkspaceShell(page);

    await signInPage.goto();
    await screenshot(page, `${role}-0-sign-in`);
    await signInPage.signIn(email, DEMO_PASSWORD);
    await page.waitForURL((url) => url.pathname === "/");
    await shell.waitUntilShown();
    expect(await shell.signedInName.textContent()).toBe(name);

    const labels = await shell.navLabels();
    expect(labels).toEqual(nav);
    if (role === "chemist") {
      expect(labels).not.toContain("Review");
      expect(labels).not.toContain("Outgoing mail");
    }

    for (const [index, label] of labels.entries()) {
      await shell.visit(label);
      expect(await shell.currentNavItem()).toBe(label);
      expect(await shell.errorBoundary.count(), `${label} shows the error boundary`).toBe(0);
      const heading = (await shell.pageHeading.first().textContent()) ?? "";
      expect(heading, `${label} rendered the not-found page`).not.toBe("Not found");
      expect(heading.trim().length).toBeGreaterThan(0);
      await screenshot(page, `${role}-${index + 1}-${slug(label)}`);
    }
    expect(browser.problems, browser.problems.join("\n")).toEqual([]);

    await shell.signOut();
    await signInPage.heading.waitFor();
    expect(await signInPage.isShown()).toBe(true);
    const cookies = await browser.context.cookies();
    expect(cookies.filter((c) => c.name === "emberline_session")).toEqual([]);
    // After sign-out the workspace is closed again.
    await page.goto("/account");
    await page.waitForURL((url) => url.pathname === "/sign-in");
  });
});

describe("the lab lead's team switcher", () => {
  it("opens in Flame Screening as lab lead, then moves the workspace to Arc and Spark Bench as supervisor", async () => {
    const { page } = browser;
    await new SignInPage(page).goto();
    await new SignInPage(page).signIn("lead@demo.emberline.example", DEMO_PASSWORD);
    const shell = new WorkspaceShell(page);
    await shell.waitUntilShown();
    const switcher = page.getByLabel("Team", { exact: true });
    expect(await switcher.locator("option:checked").textContent()).toBe(
      "Flame Screening — Lab lead",
    );
    expect(
      await page.locator("aside").getByText("lead@demo.emberline.example · Lab lead").count(),
    ).toBe(1);
    await shell.visit("Team");
    expect(await shell.pageHeading.first().textContent()).toBe("Flame Screening");
    await page.getByRole("heading", { name: "Invite a person" }).waitFor();
    await screenshot(page, "lab-lead-flame-screening-team");
    await shell.visit("Outgoing mail");
    await screenshot(page, "lab-lead-flame-screening-outgoing-mail");

    await switcher.selectOption({ label: "Arc and Spark Bench — Supervisor" });
    await page.waitForFunction(() =>
      Boolean(document.querySelector('nav[aria-label="Areas"] a[href="/review"]')),
    );
    expect(await shell.navLabels()).toEqual([
      "Home",
      "Notebooks",
      "Instruments",
      "Line library",
      "Review",
      "Audit trail",
      "Team",
      "Outgoing mail",
      "Account",
    ]);
    expect(
      await page.locator("aside").getByText("lead@demo.emberline.example · Supervisor").count(),
    ).toBe(1);
    // The switcher names the team just chosen (React 19 resets forms after an action).
    expect(await switcher.locator("option:checked").textContent()).toBe(
      "Arc and Spark Bench — Supervisor",
    );
    await screenshot(page, "lab-lead-arc-and-spark-bench-home");
    expect(browser.problems, browser.problems.join("\n")).toEqual([]);
    await shell.signOut();
  });
});

describe("anonymous visitors", () => {
  it("are sent from / to the sign-in page", async () => {
    const { page } = browser;
    const response = await page.goto("/");
    expect(new URL(page.url()).pathname).toBe("/sign-in");
    expect(response?.status()).toBe(200);
    expect(await new SignInPage(page).isShown()).toBe(true);
    await screenshot(page, "anonymous-redirect-to-sign-in");
  });

  it("keep the page they asked for and land there after signing in", async () => {
    const { page } = browser;
    await page.goto("/team");
    const url = new URL(page.url());
    expect(url.pathname).toBe("/sign-in");
    expect(url.searchParams.get("next")).toBe("/team");
    await new SignInPage(page).signIn("super@demo.emberline.example", DEMO_PASSWORD);
    await page.waitForURL((u) => u.pathname === "/team");
    await new WorkspaceShell(page).waitUntilShown();
  });

  it("see the generic error for a wrong password and stay on the sign-in page", async () => {
    const { page } = browser;
    const signInPage = new SignInPage(page);
    await signInPage.goto();
    await signInPage.signIn("chem@demo.emberline.example", "not the demo password");
    await signInPage.message.getByText("The e-mail address or password is not right.").waitFor();
    expect(new URL(page.url()).pathname).toBe("/sign-in");
    await screenshot(page, "anonymous-wrong-password");
    expect((await browser.context.cookies()).some((c) => c.name === "emberline_session")).toBe(
      false,
    );
  });
});

describe("the sign-in form after a failure", () => {
  it("keeps the e-mail address filled in", async () => {
    const { page } = browser;
    const signInPage = new SignInPage(page);
    await signInPage.goto();
    await signInPage.signIn("chem@demo.emberline.example", "not the demo password");
    await signInPage.message.getByText("The e-mail address or password is not right.").waitFor();
    expect(await signInPage.email.inputValue()).toBe("chem@demo.emberline.example");
  });
});

// Page object of the signed-in shell: the area navigation, who is signed in, and sign-out.
import type { Locator, Page } from "playwright-core";

export class WorkspaceShell {
  readonly nav: Locator;
  readonly signedInName: Locator;
  readonly signOutButton: Locator;
  readonly pageHeading: Locator;
  readonly errorBoundary: Locator;
  /** The top bar's "Menu" button, shown below the sidebar breakpoint (900 px). */
  readonly menuButton: Locator;

  constructor(private readonly page: Page) {
    this.nav = page.getByRole("navigation", { name: "Areas" });
    this.signedInName = page.getByTestId("signed-in-name");
    this.signOutButton = page.getByRole("button", { name: "Sign out" });
    this.pageHeading = page.locator("main#main h1");
    this.errorBoundary = page
      .getByRole("alert")
      .filter({ hasText: "This page could not be shown" });
    this.menuButton = page.getByRole("button", { name: "Menu", exact: true });
  }

  /** Signed in on a narrow screen, where the areas hide behind the menu button. */
  async waitUntilShownNarrow(): Promise<void> {
    await this.menuButton.waitFor();
    await this.signedInName.waitFor({ state: "attached" });
  }

  async menuExpanded(): Promise<boolean> {
    return (await this.menuButton.getAttribute("aria-expanded")) === "true";
  }

  async waitUntilShown(): Promise<void> {
    await this.nav.waitFor();
    await this.signedInName.waitFor();
  }

  async navLabels(): Promise<string[]> {
    return (await this.nav.getByRole("link").allTextContents()).map((label) => label.trim());
  }

  async navHref(label: string): Promise<string> {
    const href = await this.nav
      .getByRole("link", { name: label, exact: true })
      .getAttribute("href");
    if (!href) throw new Error(`The nav item ${label} has no href`);
    return href;
  }

  /** Follows a nav link and waits until its page is the current one. */
  async visit(label: string): Promise<void> {
    const href = await this.navHref(label);
    const link = this.nav.getByRole("link", { name: label, exact: true });
    await link.click();
    await this.page.waitForURL((url) => url.pathname === href);
    await this.page.waitForFunction(
      (name) =>
        document
          .querySelector(`nav[aria-label="Areas"] a[aria-current="page"]`)
          ?.textContent?.trim() === name,
      label,
    );
    await this.pageHeading.first().waitFor();
  }

  async currentNavItem(): Promise<string | null> {
    return this.nav.locator('a[aria-current="page"]').textContent();
  }

  async signOut(): Promise<void> {
    await this.signOutButton.click();
    await this.page.waitForURL((url) => url.pathname === "/sign-in");
  }
}

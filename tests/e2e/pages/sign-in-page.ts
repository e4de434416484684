// Page object of /sign-in: fill the form from the keyboard and read its messages.
import type { Locator, Page } from "playwright-core";

export class SignInPage {
  readonly heading: Locator;
  readonly email: Locator;
  readonly password: Locator;
  /** The form's one message region (role=alert while it reports an error). */
  readonly message: Locator;

  constructor(private readonly page: Page) {
    this.heading = page.getByRole("heading", { level: 1, name: "Sign in" });
    this.email = page.getByLabel("E-mail");
    this.password = page.getByLabel("Password", { exact: true });
    this.message = page.locator("form [role=alert]");
  }

  async goto(): Promise<void> {
    await this.page.goto("/sign-in");
    await this.heading.waitFor();
  }

  /** Types like a person: click into the e-mail field, type, Tab, type, Enter. */
  async signIn(email: string, password: string): Promise<void> {
    await this.email.click();
    await this.page.keyboard.type(email);
    await this.page.keyboard.press("Tab");
    await this.page.keyboard.type(password);
    await this.page.keyboard.press("Enter");
  }

  isShown(): Promise<boolean> {
    return this.heading.isVisible();
  }
}

/** Starts over as another demo person: drops the cookies, signs in by keyboard, waits for home. */
export async function signInAs(
  session: { page: Page; context: { clearCookies(): Promise<void> } },
  email: string,
  password: string,
): Promise<void> {
  await session.context.clearCookies();
  const signIn = new SignInPage(session.page);
  await signIn.goto();
  await signIn.signIn(email, password);
  await session.page.waitForURL((url) => url.pathname === "/");
}

// Page object of /team: the member table (role select and Save, Remove with its confirmation), the
// invitations not yet accepted (Resend, Revoke) and the live regions that report each change.
import type { Locator, Page } from "playwright-core";

export class TeamPage {
  readonly heading: Locator;
  readonly memberRows: Locator;
  /** The live region above the member table. */
  readonly memberMessage: Locator;
  /** The live region above the invitations. */
  readonly invitationMessage: Locator;
  readonly dialog: Locator;

  constructor(private readonly page: Page) {
    this.heading = page.locator("main#main h1");
    this.memberRows = page.getByTestId("member-row");
    this.memberMessage = page.getByTestId("member-message");
    this.invitationMessage = page.getByTestId("invitation-message");
    this.dialog = page.getByRole("dialog");
  }

  async goto(): Promise<void> {
    await this.page.goto("/team");
    await this.page.getByRole("heading", { name: /^Members \(\d+\)$/ }).waitFor();
  }

  memberRow(email: string): Locator {
    return this.page.locator(`[data-testid="member-row"][data-email="${email}"]`);
  }

  roleSelect(name: string): Locator {
    return this.page.getByLabel(`Role of ${name}`, { exact: true });
  }

  saveRoleButton(name: string): Locator {
    return this.page.getByRole("button", { name: `Save the role of ${name}`, exact: true });
  }

  removeButton(name: string): Locator {
    return this.page.getByRole("button", { name: `Remove ${name} from the team`, exact: true });
  }

  invitationRow(email: string): Locator {
    return this.page.locator(`[data-testid="invitation-row"][data-email="${email}"]`);
  }

  resendButton(email: string): Locator {
    return this.page.getByRole("button", { name: `Resend the invitation to ${email}` });
  }

  revokeButton(email: string): Locator {
    return this.page.getByRole("button", { name: `Revoke the invitation to ${email}` });
  }

  /** The accessible name (text) of the element that has the keyboard focus. */
  focusedText(): Promise<string> {
    return this.page.evaluate(() => document.activeElement?.textContent?.trim() ?? "");
  }

  /**
   * Moves the keyboard focus onto `target` and presses Enter, as a keyboard user would. Waits first
   * until `target` is enabled: the list's buttons stay disabled until the previous action's refresh
   * has finished, which can be after its message shows, and Enter on a disabled button does nothing.
   */
  async pressEnterOn(target: Locator): Promise<void> {
    await target.click({ trial: true });
    await target.focus();
    await this.page.keyboard.press("Enter");
  }
}

// Team management in Chromium. Two browsers: a member signed in on one, the demo lab lead on the
// other. The lead removes the member from the team page with the keyboard (confirmation dialog,
// Cancel focused first, Escape closes), and the member's open session gets 401 on its next request
// for the team's records. The lead changes another member's role, is refused demoting themselves
// as the only lab lead (the sentence shows in the live region), and resends and revokes an
// invitation, whose link then says it was revoked (these in a team of the test's own). A chemist
// sees the list without any control.
// Screenshots go to test-output/e2e/.
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { openBrowser, screenshot, type Session } from "./support/browser";
import { signInAs } from "./pages/sign-in-page";
import { TeamPage } from "./pages/team-page";
import {
  DEMO,
  DEMO_PASSWORD,
  FLAME_SCREENING,
  createAccountThroughInvitation,
  signInDemo,
  teamIdOf,
  uniqueEmail,
  type FreshAccount,
  signedIn,
} from "../integration/support/accounts";
import { closeDb } from "../integration/support/database";
import type { ApiClient } from "../integration/support/http-client";
import { extractLinkToken, waitForMail } from "../integration/support/mailbox";
import {
  joinWithExistingAccount,
  scratchTeam,
  type ScratchTeam,
} from "../integration/support/scratch-team";

let leadBrowser: Session;
let memberBrowser: Session;
let leadApi: ApiClient;
let flameTeamId: string;

beforeAll(async () => {
  [leadBrowser, memberBrowser] = await Promise.all([openBrowser(), openBrowser()]);
  leadApi = await signInDemo("labLead");
  flameTeamId = await teamIdOf(leadApi, FLAME_SCREENING);
});

afterAll(async () => {
  await Promise.all([leadBrowser?.close(), memberBrowser?.close()]);
  await closeDb();
});

/** A request from inside the member's open page, with its session cookie, as the app's own code makes. */
async function fetchInPage(
  session: Session,
  path: string,
): Promise<{ status: number; message: string | null }> {
  return session.page.evaluate(async (url) => {
    const response = await fetch(url, { headers: { accept: "application/json" } });
    const body = (await response.json().catch(() => null)) as {
      error?: { message?: string };
    } | null;
    return { status: response.status, message: body?.error?.message ?? null };
  }, path);
}

describe("removing a member", () => {
  let member: FreshAccount;

  it("shows a chemist the member list without any control", async () => {
    member = await createAccountThroughInvitation(leadApi, { label: "e2e-removed" });
    await signInAs(memberBrowser, member.email, member.password);
    const team = new TeamPage(memberBrowser.page);
    await team.goto();
    expect(await team.heading.textContent()).toBe(FLAME_SCREENING);
    await team.memberRow(DEMO.labLead.email).waitFor();
    expect(await team.memberRow(member.email).textContent()).toContain("(you)");
    const main = memberBrowser.page.locator("main#main");
    expect(await main.locator("select").count()).toBe(0);
    expect(await main.getByRole("button").count()).toBe(0);
    expect(await memberBrowser.page.getByRole("heading", { name: "Invite a person" }).count()).toBe(
      0,
    );
    await screenshot(memberBrowser.page, "team-management-0-chemist-view");
    // The member's session opens the team's records.
    await memberBrowser.page.goto("/notebooks");
    expect((await fetchInPage(memberBrowser, `/api/notebooks?teamId=${flameTeamId}`)).status).toBe(
      200,
    );
    expect(memberBrowser.problems, memberBrowser.problems.join("\n")).toEqual([]);
  });

  it("from the team page with the keyboard; the member's open session then gets 401 for the team", async () => {
    await signInAs(leadBrowser, DEMO.labLead.email, DEMO_PASSWORD);
    const team = new TeamPage(leadBrowser.page);
    await team.goto();
    await team.memberRow(member.email).waitFor();
    await screenshot(leadBrowser.page, "team-management-1-lead-view");
    // However many members and long addresses earlier tests left, the page does not scroll sideways.
    expect(
      await leadBrowser.page.evaluate(
        () => document.documentElement.scrollWidth <= window.innerWidth,
      ),
    ).toBe(true);

    // Enter opens the confirmation with Cancel focused; Escape closes it and nothing happens.
    await team.pressEnterOn(team.removeButton(member.name));
    await team.dialog.waitFor();
    expect(await team.dialog.getByRole("heading").textContent()).toBe(
      `Remove ${member.name} from ${FLAME_SCREENING}?`,
    );
    expect(await team.focusedText()).toBe("Cancel");
    await screenshot(leadBrowser.page, "team-management-2-remove-dialog");
    await leadBrowser.page.keyboard.press("Escape");
    await team.dialog.waitFor({ state: "hidden" });
    expect(await team.focusedText()).toBe("Remove…");
    expect(await team.memberRow(member.email).count()).toBe(1);
    expect((await fetchInPage(memberBrowser, `/api/notebooks?teamId=${flameTeamId}`)).status).toBe(
      200,
    );

    // Again, and this time Tab to the confirming button and Enter.
    await leadBrowser.page.keyboard.press("Enter");
    await team.dialog.waitFor();
    await leadBrowser.page.keyboard.press("Tab");
    expect(await team.focusedText()).toBe(`Remove ${member.name}`);
    await leadBrowser.page.keyboard.press("Enter");
    await team.memberMessage
      .getByText(`${member.name} was removed from the team`, { exact: false })
      .waitFor();
    await team.memberRow(member.email).waitFor({ state: "detached" });
    expect(await team.memberMessage.getByRole("status").count()).toBe(1);
    await screenshot(leadBrowser.page, "team-management-3-removed");
    expect(leadBrowser.problems, leadBrowser.problems.join("\n")).toEqual([]);

    // The member's browser still holds its session: its next request for the team's records is refused.
    const after = await fetchInPage(memberBrowser, `/api/notebooks?teamId=${flameTeamId}`);
    expect(after.status).toBe(401);
    expect(after.message).toMatch(/^A lab lead removed you from this team/);
    const mail = await waitForMail({ to: member.email, subject: /removed from Flame Screening/ });
    expect(mail.text).toContain(`${DEMO.labLead.name} removed you from ${FLAME_SCREENING}.`);
  });
});

// In a team of the test's own, whose only lab lead is a fresh person: other tests invite more lab
// leads into Flame Screening, and the demo lead must never be the one demoted.
describe("roles and invitations on the team page", () => {
  let scratch: ScratchTeam;

  beforeAll(async () => {
    scratch = await scratchTeam(leadApi);
  });

  it("changes a member's role from the keyboard, and refuses the only lab lead's own demotion in the live region", async () => {
    const { founder } = scratch;
    const person = await createAccountThroughInvitation(leadApi, { label: "e2e-role" });
    await joinWithExistingAccount(
      await signedIn(founder.email, founder.password),
      scratch.teamId,
      scratch.name,
      person,
    );
    const { page } = leadBrowser;
    // The founder opens in the team where they are lab lead.
    await signInAs(leadBrowser, founder.email, founder.password);
    const team = new TeamPage(page);
    await team.goto();
    expect(await team.heading.textContent()).toBe(scratch.name);
    const select = team.roleSelect(person.name);
    expect(await select.inputValue()).toBe("chemist");
    expect(await team.saveRoleButton(person.name).isDisabled()).toBe(true);
    await select.focus();
    await select.selectOption("supervisor");
    await page.keyboard.press("Tab");
    expect(await team.focusedText()).toBe("Save");
    await page.keyboard.press("Enter");
    await team.memberMessage.getByText(`${person.name} is now supervisor`).waitFor();
    await page.reload();
    await team.roleSelect(person.name).waitFor();
    expect(await team.roleSelect(person.name).inputValue()).toBe("supervisor");

    const own = team.roleSelect(founder.name);
    await own.selectOption("chemist");
    await team.pressEnterOn(team.saveRoleButton(founder.name));
    const refusal = team.memberMessage.getByRole("alert");
    await refusal
      .getByText(`You are the only lab lead of ${scratch.name}, so your role cannot change`, {
        exact: false,
      })
      .waitFor();
    expect(await own.getAttribute("aria-invalid")).toBe("true");
    expect(await own.getAttribute("aria-describedby")).toBe("member-message");
    expect(await refusal.getAttribute("aria-live")).toBe("polite");
    await screenshot(page, "team-management-4-last-lead-refused");
    await page.reload();
    await team.roleSelect(founder.name).waitFor();
    expect(await team.roleSelect(founder.name).inputValue()).toBe("lab_lead");
    expect(leadBrowser.problems, leadBrowser.problems.join("\n")).toEqual([]);
  });

  it("resends and revokes an invitation; the revoked link says so", async () => {
    const { page } = leadBrowser;
    const team = new TeamPage(page);
    const email = uniqueEmail("e2e-invitee");
    await signInAs(leadBrowser, scratch.founder.email, scratch.founder.password);
    await team.goto();
    await page.getByLabel("E-mail", { exact: true }).fill(email);
    await page.getByRole("button", { name: "Send invitation" }).click();
    await team.invitationRow(email).waitFor();
    const invitedTo = new RegExp(`invited to ${scratch.name}`);
    const first = await waitForMail({ to: email, subject: invitedTo });

    await team.pressEnterOn(team.resendButton(email));
    await team.invitationMessage.getByText(`A new link is on its way to ${email}`).waitFor();
    const second = await waitForMail({ to: email, subject: invitedTo, skip: 1 });
    expect(extractLinkToken(second.text, "/invitations/")).not.toBe(
      extractLinkToken(first.text, "/invitations/"),
    );

    await team.pressEnterOn(team.revokeButton(email));
    await team.dialog.waitFor();
    expect(await team.focusedText()).toBe("Cancel");
    await page.keyboard.press("Tab");
    await page.keyboard.press("Enter");
    await team.invitationMessage.getByText(`The invitation to ${email} was revoked`).waitFor();
    await team.invitationRow(email).waitFor({ state: "detached" });
    // The form no longer says an invitation is on its way to the revoked address.
    await page.getByText(`An invitation is on its way to ${email}`).waitFor({ state: "detached" });
    await screenshot(page, "team-management-5-invitation-revoked");
    expect(leadBrowser.problems, leadBrowser.problems.join("\n")).toEqual([]);

    // The newest link, opened by the invitee (signed out), refuses with the reason.
    await memberBrowser.context.clearCookies();
    await memberBrowser.page.goto(`/invitations/${extractLinkToken(second.text, "/invitations/")}`);
    await memberBrowser.page
      .getByRole("heading", { name: "This invitation is not valid" })
      .waitFor();
    expect(await memberBrowser.page.getByTestId("invitation-closed").textContent()).toBe(
      `This invitation is not valid any more: a lab lead of ${scratch.name} revoked it. Ask them for a new one if you should still join.`,
    );
    await screenshot(memberBrowser.page, "team-management-6-revoked-link");
  });
});

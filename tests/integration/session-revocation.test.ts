// What happens to a session cookie someone kept a copy of: after sign-out, and after the
// password is reset or changed (the usual answer to a stolen password or an unattended PC).
// The cookie names a server-side session record (user_sessions) that sign-out, a reset and a
// change of password revoke, so a kept copy of the cookie stops working.
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { ApiClient } from "./support/http-client";
import {
  createAccountThroughInvitation,
  signInDemo,
  signedIn,
  strongPassword,
  type FreshAccount,
} from "./support/accounts";
import { extractLinkToken, waitForMail } from "./support/mailbox";
import { closeDb } from "./support/database";

let lead: ApiClient;

beforeAll(async () => {
  lead = await signInDemo("labLead");
});

afterAll(closeDb);

/** A second client that replays the first one's session cookie, like a copied cookie would. */
function replay(original: ApiClient): ApiClient {
  const copy = new ApiClient();
  copy.setCookie("emberline_session", original.cookie("emberline_session")!);
  return copy;
}

async function person(label: string): Promise<FreshAccount> {
  return createAccountThroughInvitation(lead, { label });
}

describe("session revocation", () => {
  it("a copy of the session cookie must stop working after sign-out", async () => {
    const account = await person("revoke-signout");
    const client = await signedIn(account.email, account.password);
    const copy = replay(client);
    expect((await copy.get("/api/me")).status).toBe(200);
    expect((await client.delete("/api/session")).status).toBe(204);
    expect((await copy.get("/api/me")).status).toBe(401);
  });

  it("sessions opened before a password reset must stop working after it", async () => {
    const account = await person("revoke-reset");
    const before = await signedIn(account.email, account.password);
    await new ApiClient().post("/api/password-reset", { email: account.email });
    const mail = await waitForMail({ to: account.email, subject: /Reset your Emberline password/ });
    const token = extractLinkToken(mail.text, "/reset-password/");
    expect(
      (
        await new ApiClient().post("/api/password-reset/confirm", {
          token,
          password: strongPassword(),
        })
      ).status,
    ).toBe(200);
    expect((await before.get("/api/me")).status).toBe(401);
  });

  it("other sessions must stop working after a password change", async () => {
    const account = await person("revoke-change");
    const other = await signedIn(account.email, account.password);
    const here = await signedIn(account.email, account.password);
    const reply = await here.post("/api/password", {
      currentPassword: account.password,
      newPassword: strongPassword(),
    });
    expect(reply.status).toBe(200);
    expect((await other.get("/api/me")).status).toBe(401);
  });
});

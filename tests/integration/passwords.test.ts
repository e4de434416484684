// Password reset through the mailed link, password change, and the password policy's messages.
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { ApiClient, type ErrorBody } from "./support/http-client";
import {
  createAccountThroughInvitation,
  signInDemo,
  signedIn,
  strongPassword,
  uniqueEmail,
  type FreshAccount,
} from "./support/accounts";
import { extractLinkToken, mailTo, waitForMail } from "./support/mailbox";
import { closeDb } from "./support/database";

const RESET_SUBJECT = /^Reset your Emberline password$/;

let lead: ApiClient;

beforeAll(async () => {
  lead = await signInDemo("labLead");
});

afterAll(closeDb);

async function requestResetToken(person: FreshAccount): Promise<string> {
  const before = mailTo(person.email).filter((m) => RESET_SUBJECT.test(m.subject)).length;
  const reply = await new ApiClient().post<{ message: string }>("/api/password-reset", {
    email: person.email,
  });
  expect(reply.status).toBe(202);
  const mail = await waitForMail({ to: person.email, subject: RESET_SUBJECT, skip: before });
  expect(mail.text).toContain(`Hello ${person.name},`);
  return extractLinkToken(mail.text, "/reset-password/");
}

describe("password reset", () => {
  it("goes from the request to the mailed link to a new password; the old one stops working", async () => {
    const person = await createAccountThroughInvitation(lead, { label: "reset" });
    const token = await requestResetToken(person);
    const newPassword = strongPassword();

    const confirmed = await new ApiClient().post<{ message: string }>(
      "/api/password-reset/confirm",
      {
        token,
        password: newPassword,
      },
    );
    expect(confirmed.status).toBe(200);
    expect(confirmed.body.message).toBe(
      "Your password is changed. Every session was signed out. You had no access tokens.",
    );

    const old = await new ApiClient().post<ErrorBody>("/api/session", {
      email: person.email,
      password: person.password,
    });
    expect(old.status).toBe(401);
    await signedIn(person.email, newPassword);

    // The link cannot be used twice.
    const twice = await new ApiClient().post<ErrorBody>("/api/password-reset/confirm", {
      token,
      password: strongPassword(),
    });
    expect(twice.status).toBe(400);
    expect(twice.body.error.fieldErrors?.token).toEqual(["This reset link is not valid any more."]);
    await signedIn(person.email, newPassword);
  });

  it("answers 202 for an unknown address and sends no mail", async () => {
    const nobody = uniqueEmail("no-account");
    const reply = await new ApiClient().post<{ message: string }>("/api/password-reset", {
      email: nobody,
    });
    expect(reply.status).toBe(202);
    // The same words as for a real account, so the reply reveals nothing.
    expect(reply.body.message).toBe("If the address has an account, a reset link is on its way.");
    // The app makes the mail in the background after it answers (lib/services/accounts.ts); a short
    // wait covers that and a slow disk.
    await new Promise((resolve) => setTimeout(resolve, 1_000));
    expect(mailTo(nobody)).toEqual([]);
  });

  it("keeps the link usable when the new password is refused by the policy", async () => {
    const person = await createAccountThroughInvitation(lead, { label: "reset-policy" });
    const token = await requestResetToken(person);
    const short = await new ApiClient().post<ErrorBody>("/api/password-reset/confirm", {
      token,
      password: "tiny",
    });
    expect(short.status).toBe(400);
    expect(short.body.error.fieldErrors?.password).toEqual([
      "Use at least 12 characters; a few words together work well.",
    ]);
    const good = strongPassword();
    expect(
      (await new ApiClient().post("/api/password-reset/confirm", { token, password: good })).status,
    ).toBe(200);
    await signedIn(person.email, good);
  });

  it("refuses a made-up token", async () => {
    const reply = await new ApiClient().post<ErrorBody>("/api/password-reset/confirm", {
      token: "made-up-token-0123456789",
      password: strongPassword(),
    });
    expect(reply.status).toBe(400);
    expect(reply.body.error.code).toBe("validation");
  });
});

describe("password change", () => {
  it("refuses a wrong current password with a field error, and changes it with the right one", async () => {
    const person = await createAccountThroughInvitation(lead, { label: "change" });
    const client = await signedIn(person.email, person.password);

    const wrong = await client.post<ErrorBody>("/api/password", {
      currentPassword: "definitely not it",
      newPassword: strongPassword(),
    });
    expect(wrong.status).toBe(400);
    expect(wrong.body.error.fieldErrors?.currentPassword).toEqual([
      "The current password is not right.",
    ]);

    const newPassword = strongPassword();
    expect(
      (await client.post("/api/password", { currentPassword: person.password, newPassword }))
        .status,
    ).toBe(200);
    expect(
      (
        await new ApiClient().post("/api/session", {
          email: person.email,
          password: person.password,
        })
      ).status,
    ).toBe(401);
    await signedIn(person.email, newPassword);
  });

  it.each([
    ["too short", "short pw", "Use at least 12 characters; a few words together work well."],
    ["too common", "password1234", "This password is too common."],
    [
      "one repeated character",
      "aaaaaaaaaaaaaaaa",
      "The password must not be one repeated character.",
    ],
  ])(
    "explains the policy when the new password is %s (400, fieldErrors.newPassword, the field the request sent)",
    async (_label, newPassword, message) => {
      const chemist = await signInDemo("chemist");
      const reply = await chemist.post<ErrorBody>("/api/password", {
        currentPassword: "emberline-demo",
        newPassword,
      });
      expect(reply.status).toBe(400);
      expect(reply.body.error.message).toBe(message);
      expect(reply.body.error.fieldErrors?.newPassword).toContain(message);
      // The demo password still works.
      await signInDemo("chemist");
    },
  );
});

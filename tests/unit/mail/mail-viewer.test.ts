// The outgoing-mail viewer: off in production unless enabled, and secret links masked.
import { randomBytes } from "node:crypto";
import { describe, expect, it } from "vitest";
import { MASKED_SECRET, mailViewerEnabled, maskMailSecrets } from "@/lib/mail/mail-viewer";
import { invitationMail, passwordResetMail, runSubmittedMail } from "@/lib/mail/templates";

const secret = () => randomBytes(32).toString("base64url");

describe("mailViewerEnabled", () => {
  it.each([
    [{ NODE_ENV: "production" }, false],
    [{ NODE_ENV: "production", EMBERLINE_MAIL_VIEWER: "1" }, true],
    [{ NODE_ENV: "production", EMBERLINE_MAIL_VIEWER: "yes" }, false],
    [{ NODE_ENV: "development" }, true],
    [{ NODE_ENV: "development", EMBERLINE_MAIL_VIEWER: "0" }, false],
    [{}, true],
  ])("%j → %s", (settings, expected) => {
    expect(mailViewerEnabled(settings)).toBe(expected);
  });
});

describe("maskMailSecrets", () => {
  it("hides the token of a password-reset mail and keeps the words around it", () => {
    const token = secret();
    const { text } = passwordResetMail({ name: "Ada", token });
    const masked = maskMailSecrets(text);
    expect(text).toContain(token);
    expect(masked).not.toContain(token);
    expect(masked).toContain(`/reset-password/${MASKED_SECRET}`);
    expect(masked).toContain("Hello Ada,");
  });

  it("hides the token of an invitation mail", () => {
    const token = secret();
    const { text } = invitationMail({
      teamName: "Flame Screening",
      role: "chemist",
      inviterName: "Ilse",
      token,
    });
    const masked = maskMailSecrets(text);
    expect(masked).not.toContain(token);
    expect(masked).toContain(`/invitations/${MASKED_SECRET}`);
  });

  it("hides access tokens and any long random run, wherever they appear", () => {
    const token = `emb_${secret()}`;
    const loose = secret();
    const masked = maskMailSecrets(`Your token ${token} and a stray secret (${loose}).`);
    expect(masked).not.toContain(token.slice(4));
    expect(masked).not.toContain(loose);
    expect(masked).toBe(`Your token ${MASKED_SECRET} and a stray secret (${MASKED_SECRET}).`);
  });

  it("leaves a review link with a run id readable (a UUID is not a secret)", () => {
    const runId = "3f2b8c1e-9a7d-4e5f-8b6a-1c2d3e4f5a6b";
    const { text } = runSubmittedMail({
      teamName: "T",
      authorName: "A",
      runLabel: "Run",
      round: 1,
      named: true,
      runId,
    });
    expect(maskMailSecrets(text)).toBe(text);
  });
});

// Every link the app mails points at APP_URL — the demo data's own mails included: the seed submits a
// demo run for review before the app starts, and its review request must link to where the app is
// served (the test server here), not to a default address.
import { describe, expect, it } from "vitest";
import { APP_URL } from "./support/http-client";
import { readMail } from "./support/mailbox";

const LINK = /https?:\/\/[^\s)>"]+/g;

describe("links in mail", () => {
  it("the seed's review request for the demo flame run links to APP_URL", () => {
    const seeded = readMail().filter(
      (m) =>
        /^Run submitted for review: /.test(m.subject) &&
        m.to.includes("super@demo.emberline.example"),
    );
    // The seed runs before any test, so its message is the first of its kind in the mailbox.
    expect(seeded.length).toBeGreaterThan(0);
    const links = seeded[0].text.match(LINK) ?? [];
    expect(links.length).toBeGreaterThan(0);
    for (const link of links) expect(link).toMatch(new RegExp(`^${APP_URL}/review/[0-9a-f-]{36}$`));
  });

  it("no message in the mailbox links anywhere but APP_URL", () => {
    const elsewhere = readMail().flatMap((m) =>
      (m.text.match(LINK) ?? [])
        .filter((link) => !link.startsWith(`${APP_URL}/`))
        .map((link) => `${m.subject}: ${link}`),
    );
    expect(elsewhere).toEqual([]);
  });
});

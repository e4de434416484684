// After signing in, the browser goes only to a path on this site: the open-redirect forms of
// `next` land on the home page, a same-origin `next` is followed.
import { afterAll, beforeAll, beforeEach, describe, expect, it } from "vitest";
import { APP_URL, openBrowser, type Session } from "./support/browser";
import { SignInPage } from "./pages/sign-in-page";

let browser: Session;

beforeAll(async () => {
  browser = await openBrowser();
});

afterAll(async () => {
  await browser?.close();
});

beforeEach(async () => {
  await browser.context.clearCookies();
});

async function signInWithNext(next: string): Promise<URL> {
  const { page } = browser;
  await page.goto(`/sign-in?next=${next}`);
  const form = new SignInPage(page);
  await form.heading.waitFor();
  await form.signIn("super@demo.emberline.example", "emberline-demo");
  await page.waitForURL((url) => url.pathname !== "/sign-in");
  return new URL(page.url());
}

describe("sign-in's next", () => {
  it.each(["/%5Cevil.example/", "//evil.example/", "https://evil.example/", "/%09/evil.example"])(
    "next=%s lands on this site's home page",
    async (next) => {
      const landed = await signInWithNext(next);
      expect(landed.origin).toBe(new URL(APP_URL).origin);
      expect(landed.pathname).toBe("/");
    },
  );

  it("follows a same-origin next", async () => {
    const landed = await signInWithNext("/notebooks");
    expect(landed.origin).toBe(new URL(APP_URL).origin);
    expect(landed.pathname).toBe("/notebooks");
  });
});

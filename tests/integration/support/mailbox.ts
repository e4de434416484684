// Reads the fake SMTP server's folder (one JSON file per message) and waits for a message.
import fs from "node:fs";
import path from "node:path";
import { APP_URL } from "./http-client";

export interface StoredMail {
  id: string;
  receivedAt: string;
  from: string;
  to: string[];
  subject: string;
  text: string;
}

export function mailDir(): string {
  const dir = process.env.EMBERLINE_MAIL_DIR;
  if (!dir)
    throw new Error("EMBERLINE_MAIL_DIR is not set: run the tests through scripts/test.mjs");
  return dir;
}

/** Every stored message, oldest first (file names start with the receive time). */
export function readMail(): StoredMail[] {
  const dir = mailDir();
  if (!fs.existsSync(dir)) return [];
  return fs
    .readdirSync(dir)
    .filter((name) => name.endsWith(".json") && !name.startsWith("."))
    .sort()
    .map((name) => JSON.parse(fs.readFileSync(path.join(dir, name), "utf8")) as StoredMail);
}

export function mailTo(address: string): StoredMail[] {
  const wanted = address.toLowerCase();
  return readMail().filter((m) => m.to.some((to) => to.toLowerCase() === wanted));
}

/** Polls the folder until a message to `to` whose subject matches arrives; fails after the timeout. */
export async function waitForMail(query: {
  to: string;
  subject: RegExp;
  /** Ignore messages already counted (e.g. an earlier reset mail to the same person). */
  skip?: number;
  timeoutMs?: number;
}): Promise<StoredMail> {
  const deadline = Date.now() + (query.timeoutMs ?? 10_000);
  for (;;) {
    const matches = mailTo(query.to).filter((m) => query.subject.test(m.subject));
    if (matches.length > (query.skip ?? 0)) return matches[matches.length - 1];
    if (Date.now() > deadline) {
      throw new Error(
        `No mail to ${query.to} with subject ${query.subject} within ${query.timeoutMs ?? 10_000} ms`,
      );
    }
    await new Promise((resolve) => setTimeout(resolve, 100));
  }
}

/** The token of the first link `<APP_URL><pathPrefix><token>` in a message's text. */
export function extractLinkToken(text: string, pathPrefix: string): string {
  const escaped = `${APP_URL}${pathPrefix}`.replace(/[.*+?^${}()|[\]\\]/g, "\\$&");
  const match = new RegExp(`${escaped}([A-Za-z0-9_-]+)`).exec(text);
  if (!match) throw new Error(`No ${pathPrefix} link in the message:\n${text}`);
  return match[1];
}

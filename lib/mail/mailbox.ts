// Reads the messages the local fake SMTP server kept (development and tests only).
import fs from "node:fs/promises";
import path from "node:path";
import { env } from "../env";

export interface StoredMail {
  id: string;
  receivedAt: string;
  from: string;
  to: string[];
  subject: string;
  text: string;
}

/** Newest first; an empty list when no fake mailbox is configured. */
export async function readMailbox(limit = 200): Promise<StoredMail[]> {
  const dir = env().mailDir;
  if (!dir) return [];
  let names: string[];
  try {
    names = (await fs.readdir(dir))
      .filter((n) => n.endsWith(".json"))
      .sort()
      .reverse()
      .slice(0, limit);
  } catch {
    return [];
  }
  const messages = await Promise.all(
    names.map(
      async (name) => JSON.parse(await fs.readFile(path.join(dir, name), "utf8")) as StoredMail,
    ),
  );
  return messages;
}

export function mailboxConfigured(): boolean {
  return Boolean(env().mailDir);
}

// Random secrets for links and access tokens; only their SHA-256 is ever stored.
import crypto from "node:crypto";

export function newSecretToken(prefix = ""): string {
  return `${prefix}${crypto.randomBytes(32).toString("base64url")}`;
}

export function hashToken(token: string): string {
  return crypto.createHash("sha256").update(token).digest("hex");
}

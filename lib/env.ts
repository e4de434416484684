// The app's settings, read once from the environment with development defaults that are safe
// on loopback. Production refuses to start without a real session secret.
import crypto from "node:crypto";
import { mailViewerEnabled } from "./mail/mail-viewer";

const production = process.env.NODE_ENV === "production" && process.env.EMBERLINE_ALLOW_DEV_SECRET !== "1";

let secret: string | undefined;

/** The session secret, read when first needed (a build must not require it). */
export function sessionSecret(): string {
  secret ??= readSessionSecret();
  return secret;
}

function readSessionSecret(): string {
  const value = process.env.SESSION_SECRET;
  if (value && value.length >= 32) return value;
  if (value) throw new Error("SESSION_SECRET must be at least 32 characters long.");
  if (production) throw new Error("SESSION_SECRET is required in production (32 characters or more).");
  // A per-process development secret: sessions end when the process restarts.
  const generated = crypto.randomBytes(32).toString("base64url");
  process.env.SESSION_SECRET = generated;
  return generated;
}

let cached: ReturnType<typeof readEnv> | undefined;

function readEnv() {
  return {
    databaseUrl: process.env.DATABASE_URL ?? "postgres://postgres@127.0.0.1:54329/emberline",
    databasePoolMax: Number(process.env.DATABASE_POOL_MAX ?? 10),
    /** Cookies marked Secure: on in production unless the app is served over plain HTTP on loopback. */
    secureCookies: process.env.SECURE_COOKIES
      ? process.env.SECURE_COOKIES === "true"
      : process.env.NODE_ENV === "production" && !(process.env.APP_URL ?? "").startsWith("http://"),
    appUrl: (process.env.APP_URL ?? "http://127.0.0.1:3000").replace(/\/$/, ""),
    smtp: {
      host: process.env.SMTP_HOST ?? "127.0.0.1",
      port: Number(process.env.SMTP_PORT ?? 2525),
      secure: process.env.SMTP_SECURE === "true",
      user: process.env.SMTP_USER,
      password: process.env.SMTP_PASSWORD,
      from: process.env.MAIL_FROM ?? "Emberline <no-reply@emberline.example>",
    },
    /** Folder where the local fake SMTP server keeps messages; unset in production. */
    mailDir: process.env.EMBERLINE_MAIL_DIR,
    /** Whether the outgoing-mail viewer exists at all (lib/mail/mail-viewer.ts): off in production unless enabled. */
    mailViewer: mailViewerEnabled(process.env),
    /** Whether everyone (not only lab leads) may use the viewer: development only. */
    openMailbox: process.env.NODE_ENV !== "production",
  };
}

export function env() {
  cached ??= readEnv();
  return cached;
}

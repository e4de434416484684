// The app's settings, read once from the environment with development defaults that are safe
// on loopback. Production refuses to start without a real session secret.
import crypto from "node:crypto";
import { mailViewerEnabled } from "./mail/mail-viewer";

const production =
  process.env.NODE_ENV === "production" && process.env.EMBERLINE_ALLOW_DEV_SECRET !== "1";

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
  if (production)
    throw new Error("SESSION_SECRET is required in production (32 characters or more).");
  // A per-process development secret: sessions end when the process restarts.
  const generated = crypto.randomBytes(32).toString("base64url");
  process.env.SESSION_SECRET = generated;
  return generated;
}

let cached: ReturnType<typeof readEnv> | undefined;

/** The local cluster's roles (db/cluster.mjs creates them): the app's, and the owner that migrates. */
export const LOCAL_APP_ROLE = "emberline_app";
export const LOCAL_OWNER_ROLE = "emberline_owner";

/** `url` with another user and no password: the owner's URL on the same server and database. */
export function withRole(url: string, role: string): string {
  const parsed = new URL(url);
  parsed.username = role;
  parsed.password = "";
  return parsed.toString();
}

function readEnv() {
  const databaseUrl =
    process.env.DATABASE_URL ??
    `postgres://${LOCAL_APP_ROLE}@127.0.0.1:${process.env.EMBERLINE_PG_PORT ?? 54329}/${process.env.EMBERLINE_DB_NAME ?? "emberline"}`;
  return {
    /** What the app (server, seed, scripts that go through services) connects as: the app role. */
    databaseUrl,
    /** What migrations connect as: the role that owns the schema. Never given to the running app. */
    databaseOwnerUrl: process.env.DATABASE_OWNER_URL ?? withRole(databaseUrl, LOCAL_OWNER_ROLE),
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

// The signed, encrypted session cookie (iron-session) and the signed-in person behind a request.
import "server-only";
import { getIronSession, unsealData, type SessionOptions } from "iron-session";
import { cookies, headers } from "next/headers";
import { env, sessionSecret } from "@/lib/env";
import { unauthenticated } from "@/lib/errors";
import { actorFromAccessToken, loadSessionActor } from "@/lib/services/accounts";
import { openSession, revokeSession, SESSION_HOURS } from "@/lib/services/sessions";
import type { Actor } from "./actor";
import { defaultTeamId } from "./default-team";
import { SESSION_COOKIE } from "./session-cookie";

export { SESSION_COOKIE };

export interface SessionData {
  /** The server-side session record (user_sessions); revoking it ends the session. */
  sessionId?: string;
  userId?: string;
  /** The team the person last chose in the team switcher. */
  teamId?: string;
  signedInAt?: number;
}

function sessionOptions(): SessionOptions {
  const settings = env();
  return {
    password: sessionSecret(),
    cookieName: SESSION_COOKIE,
    ttl: SESSION_HOURS * 3600,
    cookieOptions: { httpOnly: true, sameSite: "lax", secure: settings.secureCookies, path: "/" },
  };
}

export async function getSession() {
  return getIronSession<SessionData>(await cookies(), sessionOptions());
}

/** How long an unsealed cookie is reused, and how many are kept (the oldest go first). */
const UNSEALED_TTL_MS = 60_000;
const UNSEALED_MAX = 5_000;
const unsealed = new Map<string, { data: SessionData; until: number }>();

/**
 * The session cookie's contents, for reading only. Unsealing costs two key derivations on libuv's
 * thread pool, which argon2's sign-ins also use, so the same cookie is unsealed once a minute at
 * most. Keyed by the exact sealed text: a cookie changed by one byte is unsealed (and checked) anew;
 * what the session may do is still decided on every request by the database (revoked or expired
 * sessions, memberships).
 */
async function readSessionData(): Promise<SessionData> {
  const sealed = (await cookies()).get(SESSION_COOKIE)?.value;
  if (!sealed) return {};
  const now = Date.now();
  const kept = unsealed.get(sealed);
  if (kept && kept.until > now) return kept.data;
  const options = sessionOptions();
  const data = await unsealData<SessionData>(sealed, {
    password: options.password,
    ttl: options.ttl,
  });
  if (unsealed.size >= UNSEALED_MAX) {
    for (const [key, entry] of unsealed) if (entry.until <= now) unsealed.delete(key);
    if (unsealed.size >= UNSEALED_MAX) unsealed.delete(unsealed.keys().next().value!);
  }
  unsealed.set(sealed, { data, until: now + UNSEALED_TTL_MS });
  return data;
}

/** The person behind this request: a Bearer token first, then the session cookie. */
export async function currentActor(): Promise<Actor | null> {
  const authorization = (await headers()).get("authorization");
  if (authorization?.toLowerCase().startsWith("bearer ")) {
    return actorFromAccessToken(authorization.slice(7).trim());
  }
  const { sessionId } = await readSessionData();
  return sessionId ? loadSessionActor(sessionId) : null;
}

/** The person behind this request, or 401 ("Sign in first."): for route handlers and server actions. */
export async function requireActor(): Promise<Actor> {
  const actor = await currentActor();
  if (!actor) throw unauthenticated();
  return actor;
}

/** True when the request authenticates with a Bearer token (no cookie, so no CSRF risk). */
export async function usesBearerToken(): Promise<boolean> {
  return Boolean((await headers()).get("authorization")?.toLowerCase().startsWith("bearer "));
}

/** The team the person works in now: the one chosen in the switcher, else their default team. */
export async function currentTeamId(actor: Actor): Promise<string | undefined> {
  const { teamId } = await readSessionData();
  const chosen = actor.memberships.find((m) => m.teamId === teamId);
  return chosen?.teamId ?? defaultTeamId(actor);
}

/** Signs the person in on this browser: a new server-side session and its cookie. */
export async function startSession(actor: Actor): Promise<void> {
  const session = await getSession();
  session.sessionId = await openSession(actor.id);
  session.userId = actor.id;
  session.teamId = defaultTeamId(actor);
  session.signedInAt = Date.now();
  await session.save();
}

/** Signs out: revokes the server-side session (so copies of the cookie die too) and clears the cookie. */
export async function endSession(): Promise<string | undefined> {
  const session = await getSession();
  const userId = session.userId;
  if (session.sessionId) await revokeSession(session.sessionId);
  session.destroy();
  return userId;
}

export async function currentSessionId(): Promise<string | undefined> {
  return (await readSessionData()).sessionId;
}

// The signed, encrypted session cookie (iron-session) and the signed-in person behind a request.
import "server-only";
import { getIronSession, type SessionOptions } from "iron-session";
import { cookies, headers } from "next/headers";
import { env, sessionSecret } from "@/lib/env";
import { actorFromAccessToken, loadActor } from "@/lib/services/accounts";
import type { Actor } from "./actor";
import { SESSION_COOKIE } from "./session-cookie";

export { SESSION_COOKIE };

export interface SessionData {
  userId?: string;
  /** The team the person last chose in the team switcher. */
  teamId?: string;
  signedInAt?: number;
}

const SESSION_HOURS = 12;

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

/** The person behind this request: a Bearer token first, then the session cookie. */
export async function currentActor(): Promise<Actor | null> {
  const authorization = (await headers()).get("authorization");
  if (authorization?.toLowerCase().startsWith("bearer ")) {
    return actorFromAccessToken(authorization.slice(7).trim());
  }
  const session = await getSession();
  if (!session.userId) return null;
  return loadActor(session.userId);
}

/** True when the request authenticates with a Bearer token (no cookie, so no CSRF risk). */
export async function usesBearerToken(): Promise<boolean> {
  return Boolean((await headers()).get("authorization")?.toLowerCase().startsWith("bearer "));
}

/** The team the person works in now: the one chosen in the switcher, else their first. */
export async function currentTeamId(actor: Actor): Promise<string | undefined> {
  const session = await getSession();
  const chosen = actor.memberships.find((m) => m.teamId === session.teamId);
  return (chosen ?? actor.memberships[0])?.teamId;
}

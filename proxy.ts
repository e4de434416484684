// Sends anonymous visitors of workspace pages to sign-in. API routes answer 401 themselves, and
// every action and handler checks authorisation again: this is a convenience, not the guard.
import { NextResponse, type NextRequest } from "next/server";
import { SESSION_COOKIE } from "@/lib/auth/session-cookie";

export function proxy(request: NextRequest) {
  if (request.cookies.has(SESSION_COOKIE)) return NextResponse.next();
  const url = request.nextUrl.clone();
  url.pathname = "/sign-in";
  url.search = request.nextUrl.pathname === "/" ? "" : `?next=${encodeURIComponent(request.nextUrl.pathname)}`;
  return NextResponse.redirect(url);
}

export const config = {
  matcher: ["/((?!api|_next|sign-in|forgot-password|reset-password|invitations|favicon.ico|fonts).*)"],
};

// Runs before every page: gives the page a fresh CSP nonce (Next.js reads it from the request's
// Content-Security-Policy header and puts it on its own scripts), adds HSTS behind HTTPS, answers a
// path that is not valid percent-encoding with a clean 400 (Next would answer a plain-text 500), a
// server action from another site with 403 (Next would answer 500),
// and sends anonymous visitors of workspace pages to sign-in. API routes answer 401 themselves,
// and every action and handler checks authorisation again: the redirect is a convenience, not the guard.
import { NextResponse, type NextRequest } from "next/server";
import { SESSION_COOKIE } from "@/lib/auth/session-cookie";
import { originVerdict } from "@/lib/http/request-origin";
import {
  newNonce,
  pageContentSecurityPolicy,
  strictTransportSecurity,
} from "@/lib/http/security-headers";

/** Pages anyone may open without a session. */
const PUBLIC_PAGES = /^\/(sign-in|forgot-password|reset-password|invitations)(\/|$)/;

export function proxy(request: NextRequest) {
  const { pathname } = request.nextUrl;
  if (!isDecodablePath(pathname)) {
    return Response.json(
      {
        error: {
          code: "validation",
          message: "The address is not valid: it has a broken %-escape.",
        },
      },
      { status: 400 },
    );
  }
  // Next.js refuses a server action from a foreign Origin by throwing, which answers 500: say 403 instead.
  if (
    request.method === "POST" &&
    request.headers.has("next-action") &&
    ["foreign", "malformed"].includes(originVerdict(request.headers))
  ) {
    return new Response("Cross-site form posts are not accepted.", {
      status: 403,
      headers: { "content-type": "text/plain; charset=utf-8" },
    });
  }
  // /api paths reach the proxy only when they contain "%" (see the matcher); the rest are the routes' own.
  if (pathname.startsWith("/api/")) return NextResponse.next();

  if (!PUBLIC_PAGES.test(pathname) && !request.cookies.has(SESSION_COOKIE)) {
    const url = request.nextUrl.clone();
    url.pathname = "/sign-in";
    url.search = pathname === "/" ? "" : `?next=${encodeURIComponent(pathname)}`;
    return NextResponse.redirect(url);
  }

  const nonce = newNonce();
  const appUrl = process.env.APP_URL;
  const policy = pageContentSecurityPolicy(nonce, {
    development: process.env.NODE_ENV === "development",
    https: appUrl?.startsWith("https://"),
  });
  const requestHeaders = new Headers(request.headers);
  requestHeaders.set("x-nonce", nonce);
  requestHeaders.set("Content-Security-Policy", policy);
  const response = NextResponse.next({ request: { headers: requestHeaders } });
  response.headers.set("Content-Security-Policy", policy);
  const hsts = strictTransportSecurity(appUrl);
  if (hsts) response.headers.set("Strict-Transport-Security", hsts);
  return response;
}

function isDecodablePath(pathname: string): boolean {
  try {
    decodeURIComponent(pathname);
    return true;
  } catch {
    return false;
  }
}

export const config = {
  matcher: [
    // Every page (static files, images and the icon excluded); prefetches too, so they carry the nonce.
    "/((?!api/|_next/static|_next/image|favicon.ico|icon.svg|fonts/).*)",
    // API paths only when they hold a %-escape: the routes' bodies must not be buffered by the proxy.
    "/api/(.*%.*)",
  ],
};

// The shape of every JSON route handler: read the body within the route's cap, check Origin on
// cookie mutations, authenticate, parse the body with its zod schema, call a service, and map
// errors in one place.
import "server-only";
import type { z } from "zod";
import { AppError, toResponse } from "@/lib/errors";
import { usesBearerToken } from "@/lib/auth/session";
import { parseFields } from "@/lib/validation/field-errors";
import { bodyText, JSON_BODY_BYTES, readBody } from "./read-body";
import { originVerdict } from "./request-origin";
import { API_CACHE_CONTROL } from "./security-headers";

type RouteContext = { params: Promise<Record<string, string>> };

export interface ApiRouteOptions {
  /**
   * Largest request body this route accepts, in bytes; read in full (or refused with 413) before
   * the handler runs, so an oversized or slow body costs no authentication or database work.
   * @default JSON_BODY_BYTES (128 KB)
   */
  maxBodyBytes?: number;
  /** The 413's sentence when the route names its cap better than the generic one. */
  tooLargeMessage?: string;
}

export function apiRoute(
  handler: (request: Request, context: RouteContext) => Promise<Response>,
  { maxBodyBytes = JSON_BODY_BYTES, tooLargeMessage }: ApiRouteOptions = {},
): (request: Request, context: RouteContext) => Promise<Response> {
  return async (request, context) => {
    let response: Response;
    try {
      if (request.method !== "GET" && request.method !== "HEAD") {
        await readBody(request, { maxBytes: maxBodyBytes, tooLargeMessage });
        await assertSameOrigin(request);
      }
      response = await handler(request, context);
    } catch (error) {
      response = toResponse(error);
    }
    return withoutCaching(response);
  };
}

/** API answers carry personal data: nothing keeps them unless the route says how (e.g. "private, no-store"). */
function withoutCaching(response: Response): Response {
  if (response.headers.has("cache-control")) return response;
  try {
    response.headers.set("Cache-Control", API_CACHE_CONTROL);
    return response;
  } catch {
    // A Response with immutable headers (Response.redirect): copy it.
    const headers = new Headers(response.headers);
    headers.set("Cache-Control", API_CACHE_CONTROL);
    return new Response(response.body, {
      status: response.status,
      statusText: response.statusText,
      headers,
    });
  }
}

/** Cookie-authenticated mutations must come from our own pages; tokens need no such check. */
async function assertSameOrigin(request: Request): Promise<void> {
  if (await usesBearerToken()) return;
  const verdict = originVerdict(request.headers);
  if (verdict === "malformed")
    throw new AppError("forbidden", "The request's Origin header is not valid.");
  if (verdict === "foreign")
    throw new AppError("forbidden", "Cross-site requests are not accepted.");
}

export async function parseJson<T extends z.ZodType>(
  request: Request,
  schema: T,
): Promise<z.infer<T>> {
  const text = await bodyText(request);
  let body: unknown;
  try {
    body = JSON.parse(text);
  } catch {
    throw new AppError("validation", "The request body must be JSON.");
  }
  return parseFields(schema, body);
}

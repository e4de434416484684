// A small HTTP client over Node's global fetch with a cookie jar, so a test can act as one
// browser: it keeps the session cookie between requests and exposes the raw Set-Cookie lines.
import { randomInt } from "node:crypto";

export const APP_URL = (process.env.EMBERLINE_TEST_URL ?? "http://127.0.0.1:3100").replace(
  /\/$/,
  "",
);

/**
 * A fresh client address for the X-Forwarded-For header (a header value only; nothing is sent
 * there). The app throttles failed sign-ins per address, so each test file uses its own.
 */
export function testAddress(): string {
  return `10.${randomInt(0, 256)}.${randomInt(0, 256)}.${randomInt(1, 255)}`;
}

export interface ApiReply<T = unknown> {
  status: number;
  headers: Headers;
  /** The parsed JSON body, or null for an empty or non-JSON body. */
  body: T;
  /** Every Set-Cookie line of the reply, unparsed. */
  setCookies: string[];
}

export interface ErrorBody {
  error: { code: string; message: string; fieldErrors?: Record<string, string[]> };
}

export interface RequestOptions {
  /** A value to send as a JSON body. */
  json?: unknown;
  /** A raw body (sent as is, with content-type application/json unless headers say otherwise). */
  rawBody?: string;
  /** A multipart form (fetch sets its content-type with the boundary). */
  form?: FormData;
  headers?: Record<string, string>;
  /** Sends `Authorization: Bearer <token>` instead of the cookie jar. */
  bearer?: string;
}

export class ApiClient {
  private readonly cookies = new Map<string, string>();

  constructor(readonly address: string = testAddress()) {}

  /** The current value of a cookie in the jar, if any. */
  cookie(name: string): string | undefined {
    return this.cookies.get(name);
  }

  setCookie(name: string, value: string): void {
    this.cookies.set(name, value);
  }

  clearCookies(): void {
    this.cookies.clear();
  }

  async request<T = unknown>(
    method: string,
    path: string,
    options: RequestOptions = {},
  ): Promise<ApiReply<T>> {
    const headers: Record<string, string> = { "x-forwarded-for": this.address, ...options.headers };
    let body: string | FormData | undefined;
    if (options.json !== undefined) body = JSON.stringify(options.json);
    if (options.rawBody !== undefined) body = options.rawBody;
    if (body !== undefined) headers["content-type"] ??= "application/json";
    if (options.form) body = options.form;
    if (options.bearer) headers.authorization = `Bearer ${options.bearer}`;
    else if (this.cookies.size) {
      headers.cookie = [...this.cookies].map(([name, value]) => `${name}=${value}`).join("; ");
    }
    const response = await fetch(`${APP_URL}${path}`, {
      method,
      headers,
      body,
      redirect: "manual",
    });
    const setCookies = response.headers.getSetCookie();
    if (!options.bearer) this.absorb(setCookies);
    const text = await response.text();
    let parsed: unknown = null;
    try {
      parsed = text ? JSON.parse(text) : null;
    } catch {
      parsed = null;
    }
    return { status: response.status, headers: response.headers, body: parsed as T, setCookies };
  }

  get<T = unknown>(path: string, options?: RequestOptions) {
    return this.request<T>("GET", path, options);
  }

  post<T = unknown>(path: string, json?: unknown, options: RequestOptions = {}) {
    return this.request<T>("POST", path, { ...options, json });
  }

  delete<T = unknown>(path: string, options?: RequestOptions) {
    return this.request<T>("DELETE", path, options);
  }

  /** Keeps, replaces or drops cookies the way a browser would for these Set-Cookie lines. */
  private absorb(lines: string[]): void {
    for (const line of lines) {
      const cookie = parseSetCookie(line);
      const expired =
        cookie.value === "" ||
        cookie.attributes.get("max-age") === "0" ||
        (cookie.attributes.has("expires") &&
          Date.parse(cookie.attributes.get("expires")!) <= Date.now());
      if (expired) this.cookies.delete(cookie.name);
      else this.cookies.set(cookie.name, cookie.value);
    }
  }
}

export interface ParsedSetCookie {
  name: string;
  value: string;
  /** Attribute names in lower case; flags (HttpOnly, Secure) map to "". */
  attributes: Map<string, string>;
}

export function parseSetCookie(line: string): ParsedSetCookie {
  const [pair, ...rest] = line.split(";");
  const eq = pair.indexOf("=");
  const attributes = new Map<string, string>();
  for (const part of rest) {
    const [key, ...value] = part.trim().split("=");
    if (key) attributes.set(key.toLowerCase(), value.join("="));
  }
  return { name: pair.slice(0, eq).trim(), value: pair.slice(eq + 1).trim(), attributes };
}

// Where to go after sign-in: only a path on this site. `next` comes from the address bar, so
// `/\evil.example/`, `//evil.example`, `https://evil.example` or a control character in it must
// never send a person (with their fresh session) to another site.
const PLACEHOLDER_ORIGIN = "http://emberline.invalid";
const MAX_LENGTH = 2048;
// Tab, CR and LF are dropped by URL parsers, so "/\t/evil.example" would become "//evil.example".
const CONTROL = /[\u0000-\u001f\u007f-\u009f]/;

function looksHostile(text: string): boolean {
  return (
    !text.startsWith("/") || text.startsWith("//") || text.includes("\\") || CONTROL.test(text)
  );
}

/**
 * `value` as a same-origin path with its query and fragment, or `fallback` when it is anything
 * else. The raw text and its percent-decoded form are both checked (`/%5Cevil.example` is refused
 * too), then the URL is resolved against an origin and must keep that origin.
 */
export function safeNextPath(value: unknown, fallback = "/", origin = PLACEHOLDER_ORIGIN): string {
  if (typeof value !== "string" || value.length === 0 || value.length > MAX_LENGTH) return fallback;
  let decoded: string;
  try {
    decoded = decodeURIComponent(value);
  } catch {
    return fallback;
  }
  if (looksHostile(value) || looksHostile(decoded)) return fallback;
  let url: URL;
  try {
    url = new URL(value, origin);
  } catch {
    return fallback;
  }
  if (url.origin !== new URL(origin).origin) return fallback;
  return `${url.pathname}${url.search}${url.hash}`;
}

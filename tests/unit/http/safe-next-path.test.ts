// The redirect target after sign-in: same-origin paths only (the open-redirect forms are refused).
import { describe, expect, it } from "vitest";
import { safeNextPath } from "@/lib/http/safe-next-path";

describe("safeNextPath", () => {
  it.each([
    ["/", "/"],
    ["/runs/42", "/runs/42"],
    ["/notebooks?status=draft#list", "/notebooks?status=draft#list"],
    ["/lines/../audit", "/audit"],
    ["/review/%E2%9C%93", "/review/%E2%9C%93"],
  ])("keeps the same-origin path %s", (next, expected) => {
    expect(safeNextPath(next)).toBe(expected);
  });

  it.each([
    // What the address bar of `/sign-in?next=/%5Cevil.example/` hands the page (decoded once).
    "/\\evil.example/",
    // The same still encoded, and other backslash forms.
    "/%5Cevil.example/",
    "/%5cevil.example/",
    "\\\\evil.example",
    "/\\/evil.example",
    // Protocol-relative and absolute addresses.
    "//evil.example",
    "//evil.example/path",
    "/%2Fevil.example",
    "https://evil.example/",
    "http:evil.example",
    "javascript:alert(1)",
    "evil.example",
    // Control characters that URL parsers drop or browsers treat oddly.
    "/\t/evil.example",
    "/\n/evil.example",
    "/%09/evil.example",
    "/runs\u0000",
    // Not text, empty, malformed percent-encoding, absurdly long.
    "",
    "/%E0%A4%A",
    `/${"a".repeat(3000)}`,
  ])("refuses %j", (next) => {
    expect(safeNextPath(next)).toBe("/");
  });

  it("refuses values that are not strings and answers the given fallback", () => {
    expect(safeNextPath(null, "/home")).toBe("/home");
    expect(safeNextPath(undefined)).toBe("/");
    expect(safeNextPath(["/runs"])).toBe("/");
  });
});

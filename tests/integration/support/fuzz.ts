// Shared pieces of the fuzz suites: hostile values (NUL, lone surrogates, formula and script text,
// huge and odd numbers, wrong types, nesting), odd ids for path segments, the row counts of every
// table that a refused request must leave unchanged, and the signed-in identities.
import fc from "fast-check";
import { expect } from "vitest";
import "../../support/fast-check-seed";
import { signInDemo } from "./accounts";
import { db } from "./database";
import { ApiClient } from "./http-client";

export const HOSTILE_STRINGS = [
  "",
  " ",
  "\u0000",
  "a\u0000b",
  "\ud800",
  "x\udfff",
  "\ud83d",
  "\u001b[31m",
  "\u007f",
  "\u202eevil",
  "%C0%AF",
  "%00",
  "../../etc/passwd",
  "' OR 1=1 --",
  '"; DROP TABLE users; --',
  "<script>alert(1)</script>",
  '=HYPERLINK("http://evil.example/","x")',
  "+1-1",
  "@SUM(A1)",
  "9999-12-31",
  "0000-00-00",
  "-1",
  "1e999",
  "NaN",
  "Infinity",
  "null",
  "true",
  "__proto__",
  "🔥".repeat(40),
  "x".repeat(5000),
] as const;

export const ODD_IDS = [
  "%C0%AF",
  "%E0%A4%A",
  "%FF",
  "%00",
  "%2e%2e",
  "..",
  "0",
  "-1",
  "null",
  "undefined",
  "00000000-0000-0000-0000-000000000000",
  "ffffffff-ffff-ffff-ffff-ffffffffffff",
  "7BBA6CCC-7378-4E16-BD1B-04049C463C03",
  "%u0000",
  "a".repeat(300),
  "1%20OR%201%3D1",
] as const;

export const hostileString: fc.Arbitrary<string> = fc.oneof(
  { arbitrary: fc.constantFrom(...HOSTILE_STRINGS), weight: 4 },
  { arbitrary: fc.string({ unit: "binary", maxLength: 40 }), weight: 3 },
  { arbitrary: fc.string({ unit: "grapheme", maxLength: 200 }), weight: 1 },
);

export const hostileNumber: fc.Arbitrary<number> = fc.oneof(
  fc.constantFrom(
    1e308,
    -1e308,
    Number.MAX_SAFE_INTEGER + 2,
    -0,
    0,
    5e-324,
    2 ** 31,
    -(2 ** 31) - 1,
    2 ** 63,
    1.5,
  ),
  fc.double(),
  fc.integer(),
);

/** encodeURIComponent throws on lone surrogates: give it the replacement character instead. */
export function escapable(text: string): string {
  return text.replace(/[\ud800-\udfff]/g, "\ufffd");
}

/** A path segment: an odd id (kept as written, %-escapes included), a random UUID, or any text escaped. */
export const oddId: fc.Arbitrary<string> = fc.oneof(
  { arbitrary: fc.constantFrom(...ODD_IDS), weight: 4 },
  { arbitrary: fc.uuid(), weight: 2 },
  { arbitrary: hostileString.map((s) => encodeURIComponent(escapable(s)) || "x"), weight: 1 },
);

/** Any JSON-ish value, nested a little: strings, numbers, booleans, null, arrays and objects. */
export const hostileValue: fc.Arbitrary<unknown> = fc.letrec((tie) => ({
  value: fc.oneof(
    { depthSize: "small", withCrossShrink: true },
    hostileString,
    hostileNumber,
    fc.boolean(),
    fc.constant(null),
    fc.array(tie("value"), { maxLength: 4 }),
    fc.dictionary(hostileString, tie("value"), { maxKeys: 4 }),
  ),
})).value;

/** Raw bodies that JSON.stringify cannot make: broken JSON, overflowing numbers, deep nesting. */
export const RAW_BODIES = [
  "",
  "{",
  "[]",
  "null",
  "1e999",
  '{"a":1e999,"pixels":[1e999]}',
  '"\\ud800"',
  '{"name":"\\u0000"}',
  "[".repeat(50_000),
  '{"__proto__":{"isAdmin":true},"constructor":{"prototype":{"x":1}}}',
  "\u0000",
  "\xff\xfe",
  "a=1&b=2",
] as const;

/** A body for a route whose fields are known: those fields with hostile values, or anything at all. */
export function hostileBody(
  fields: readonly string[],
): fc.Arbitrary<{ raw: string } | { json: unknown }> {
  const record = fc.record(Object.fromEntries(fields.map((f) => [f, hostileValue])), {
    requiredKeys: [],
  });
  return fc.oneof(
    { arbitrary: record.map((json) => ({ json })), weight: 5 },
    { arbitrary: hostileValue.map((json) => ({ json })), weight: 2 },
    { arbitrary: fc.constantFrom(...RAW_BODIES).map((raw) => ({ raw })), weight: 1 },
  );
}

/** Tables whose row counts a refused request must leave unchanged (every table but the migration log). */
const COUNTED_TABLES = [
  "users",
  "teams",
  "memberships",
  "membership_removals",
  "invitations",
  "user_sessions",
  "access_tokens",
  "password_reset_tokens",
  "sign_in_attempts",
  "audit_events",
  "instruments",
  "spectrum_files",
  "calibrations",
  "notebooks",
  "runs",
  "run_overrides",
  "run_rounds",
  "run_review_marks",
  "run_signatures",
  "line_releases",
  "lines",
] as const;

const COUNT_SQL = `SELECT ${COUNTED_TABLES.map((t) => `(SELECT count(*) FROM ${t})::int AS ${t}`).join(", ")}`;

export async function rowCounts(): Promise<Record<string, number>> {
  const { rows } = await db().query<Record<string, number>>(COUNT_SQL);
  return rows[0];
}

export type Identity = "anonymous" | "chemist" | "labLead";
export const IDENTITIES: Identity[] = ["anonymous", "chemist", "labLead"];

export async function identities(): Promise<Record<Identity, ApiClient>> {
  return {
    anonymous: new ApiClient(),
    chemist: await signInDemo("chemist"),
    labLead: await signInDemo("labLead"),
  };
}

/** Fails with the request that broke, so the seed and the case can be read from the report. */
export function expectNoServerError(status: number, what: string): void {
  expect(status, `${what} answered ${status}`).toBeGreaterThan(0);
  expect(status, `${what} answered ${status}`).toBeLessThan(500);
}

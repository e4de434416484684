// Fuzzing the two upload routes with hostile multipart forms (fixed seed): file names with NUL, lone
// surrogates, path parts and formula text; labels and kinds of every sort; odd and real instrument ids;
// file contents from random bytes to nearly-valid two-column text with NaN, huge and empty values.
// No answer is a 5xx, and a refused upload stores no row. Storing uses odd instrument ids only, so the
// demo team's spectra stay as they are; the preview (which writes nothing) also gets the real instrument.
import fc from "fast-check";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { closeDb } from "./support/database";
import { APP_URL, type ApiClient } from "./support/http-client";
import {
  expectNoServerError,
  hostileString,
  identities,
  IDENTITIES,
  type Identity,
  oddId,
  rowCounts,
} from "./support/fuzz";

let clients: Record<Identity, ApiClient>;
let instrumentId: string;

beforeAll(async () => {
  clients = await identities();
  const instruments = await clients.chemist.get<{ id: string; name: string }[]>("/api/instruments");
  // The demo grating: its export profile (set by the seed's first upload) reads the headerless pixel
  // files below, whatever instruments other test files added before this one (the list is by name).
  instrumentId = (instruments.body.find((i) => i.name === "Bench grating") ?? instruments.body[0])
    .id;
  expect(instrumentId).toBeTruthy();
});

afterAll(() => closeDb());

const FILE_NAMES = [
  "lamp.csv",
  "a\u0000b.csv",
  "\ud800.txt",
  "../../etc/passwd",
  "=HYPERLINK(1).csv",
  "x".repeat(400),
  "",
  "spectrum.txt",
  "CON",
  "\u202etxt.exe",
];

/** Two-column text with hostile cells, random bytes, or an empty file. */
const fileContent: fc.Arbitrary<Uint8Array> = fc.oneof(
  fc
    .array(
      fc.tuple(
        fc.oneof(
          fc.double({ noNaN: false }).map(String),
          fc.constantFrom("NaN", "1e999", "-0", "", "x", "\u0000"),
        ),
        fc.oneof(fc.double().map(String), fc.constantFrom("Infinity", "1,5", "", "\ud800")),
      ),
      { maxLength: 60 },
    )
    .map((rows) => new TextEncoder().encode(rows.map(([x, y]) => `${x},${y}`).join("\n"))),
  fc.uint8Array({ maxLength: 2000 }),
  fc.constant(new Uint8Array(0)),
  fc
    .integer({ min: 16, max: 400 })
    .map((n) =>
      new TextEncoder().encode(
        Array.from({ length: n }, (_, i) => `${i},${(i * 37) % 101}`).join("\n"),
      ),
    ),
);

const hostileCase = fc.record({
  route: fc.constantFrom("/api/spectra/preview", "/api/spectra"),
  who: fc.constantFrom(...IDENTITIES),
  fileName: fc.oneof(fc.constantFrom(...FILE_NAMES), hostileString),
  content: fileContent,
  instrument: fc.oneof(
    oddId.map((id) => decodeSafely(id)),
    fc.constant("@real"),
  ),
  kind: fc.oneof(fc.constantFrom("sample", "lamp", "dark"), hostileString),
  label: fc.option(hostileString, { nil: undefined }),
  xUnit: fc.option(
    fc.oneof(
      fc.constantFrom("pixel", "pixel-from-0", "pixel-from-1", "nm", "angstrom", "wavenumber"),
      hostileString,
    ),
    { nil: undefined },
  ),
  // Mostly left out, as uploads send it, so that enough forms still reach the parser.
  medium: fc.oneof(
    { arbitrary: fc.constant(undefined), weight: 4 },
    { arbitrary: fc.constantFrom("air", "vacuum"), weight: 1 },
    { arbitrary: hostileString, weight: 1 },
  ),
  // One form in twenty comes without its file.
  withFile: fc.integer({ min: 0, max: 19 }).map((n) => n !== 0),
});

/**
 * A quarter of the forms are well formed but for their file, its name, label and stated unit (a
 * chemist previewing on the real instrument), so that with any seed (FC_SEED) enough of them reach the
 * parser: with all fields drawn at random, one seed of four brought not one form past the checks
 * before it.
 */
const nearlyValidCase = hostileCase.map((c) => ({
  ...c,
  route: "/api/spectra/preview",
  who: "chemist" as Identity,
  instrument: "@real",
  kind: "sample",
  medium: undefined,
  withFile: true,
}));

const uploadCase = fc.oneof(
  { arbitrary: hostileCase, weight: 3 },
  { arbitrary: nearlyValidCase, weight: 1 },
);

function decodeSafely(id: string): string {
  try {
    return decodeURIComponent(id);
  } catch {
    return id;
  }
}

describe("fuzz: uploads", () => {
  it("250 hostile multipart forms: no 5xx, and a refused upload stores nothing", async () => {
    let before = await rowCounts();
    const statuses = new Map<number, number>();
    await fc.assert(
      fc.asyncProperty(uploadCase, async (c) => {
        // Storing only ever names an instrument that does not exist (see the file's head).
        const instrument =
          c.instrument === "@real"
            ? c.route === "/api/spectra/preview"
              ? instrumentId
              : crypto.randomUUID()
            : c.instrument;
        const form = new FormData();
        if (c.withFile)
          form.set("file", new Blob([c.content as Uint8Array<ArrayBuffer>]), c.fileName);
        form.set("instrumentId", instrument);
        form.set("kind", c.kind);
        if (c.label !== undefined) form.set("label", c.label);
        if (c.xUnit !== undefined) form.set("xUnit", c.xUnit);
        if (c.medium !== undefined) form.set("medium", c.medium);
        const reply = await clients[c.who].request("POST", c.route, { form });
        statuses.set(reply.status, (statuses.get(reply.status) ?? 0) + 1);
        const what = `${c.who} POST ${c.route} file ${JSON.stringify(c.fileName)} (${c.content.length} bytes) instrument ${JSON.stringify(instrument)}`;
        expectNoServerError(reply.status, what);
        const after = await rowCounts();
        if (reply.status >= 400)
          expect(after, `${what} was refused (${reply.status}) but wrote rows`).toEqual(before);
        before = after;
      }),
      { numRuns: 250, endOnFailure: true },
    );
    // The cases reached the parser (200 previews and 400 located errors), not only the sign-in wall.
    expect(statuses.get(200) ?? 0, JSON.stringify([...statuses])).toBeGreaterThan(0);
    expect(statuses.get(400) ?? 0, JSON.stringify([...statuses])).toBeGreaterThan(0);
    expect(APP_URL).toMatch(/^http:\/\/127\.0\.0\.1:/);
  }, 180_000);
});

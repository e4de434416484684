// The page-weight report read from a small fake Next.js 16 build: first-load chunks are the framework's
// plus every entry of the route's client reference manifest, the chart chunk is the lazily referenced
// chunk holding the charting library, budgets are flagged, and a missing or malformed manifest is an
// error rather than a row of zeros.
import { gzipSync } from "node:zlib";
import { describe, expect, it } from "vitest";
import {
  CHART_LIBRARY_SIGNATURE,
  chunkReferences,
  entryChunksOf,
  formatPageWeights,
  measurePageWeights,
  PageWeightError,
  type BuildReader,
} from "../../../scripts/page-weight/page-weight";

/** Text of a given length that gzip shrinks only to about a third (a fixed pseudo-random sequence of letters). */
function incompressible(length: number, seed: number): string {
  let state = seed;
  let out = "";
  for (let i = 0; i < length; i++) {
    state = (state * 1_103_515_245 + 12_345) % 2 ** 31;
    out += String.fromCharCode(97 + ((state >>> 16) % 26));
  }
  return out;
}

function clientManifest(entry: string, entryJSFiles: Record<string, string[]>): string {
  return `globalThis.__RSC_MANIFEST = globalThis.__RSC_MANIFEST || {};\nglobalThis.__RSC_MANIFEST[${JSON.stringify(entry)}] = ${JSON.stringify({ moduleLoading: { prefix: "" }, clientModules: {}, entryJSFiles })};`;
}

/** A build of two pages: /runs/[id] draws a chart (its page chunk imports the chart chunk), /lines does not. */
function fakeBuild(overrides: Record<string, string | null> = {}): Record<string, string | null> {
  return {
    BUILD_ID: "fake-build\n",
    "build-manifest.json": JSON.stringify({
      polyfillFiles: ["static/chunks/polyfill.js"],
      rootMainFiles: ["static/chunks/framework.js", "static/chunks/turbopack-runtime.js"],
    }),
    "app-path-routes-manifest.json": JSON.stringify({
      "/(workspace)/runs/[id]/page": "/runs/[id]",
      "/(workspace)/lines/page": "/lines",
      "/api/runs/[id]/route": "/api/runs/[id]",
    }),
    "server/app/(workspace)/runs/[id]/page_client-reference-manifest.js": clientManifest(
      "/(workspace)/runs/[id]/page",
      {
        "[project]/app/layout": ["static/chunks/layout.js"],
        "[project]/app/(workspace)/runs/[id]/page": [
          "static/chunks/layout.js",
          "static/chunks/run.js",
        ],
      },
    ),
    "server/app/(workspace)/lines/page_client-reference-manifest.js": clientManifest(
      "/(workspace)/lines/page",
      {
        "[project]/app/layout": ["static/chunks/layout.js"],
        "[project]/app/(workspace)/lines/page": ["static/chunks/lines.js"],
      },
    ),
    "static/chunks/polyfill.js": incompressible(50_000, 1),
    "static/chunks/framework.js": incompressible(20_000, 2),
    "static/chunks/turbopack-runtime.js": incompressible(3_000, 3),
    "static/chunks/layout.js": incompressible(5_000, 4),
    // The run page's chunk loads the chart chunk lazily, as Turbopack writes a dynamic import.
    "static/chunks/run.js": `${incompressible(4_000, 5)};e.v(t=>Promise.all(["static/chunks/plot.js"].map(t=>e.l(t))).then(()=>t(1)))`,
    "static/chunks/plot.js": `${incompressible(30_000, 6)};title:"${CHART_LIBRARY_SIGNATURE} png"`,
    "static/chunks/lines.js": incompressible(2_000, 7),
    ...overrides,
  };
}

const reader =
  (files: Record<string, string | null>): BuildReader =>
  (file) => {
    const text = files[file];
    return text === undefined || text === null ? null : Buffer.from(text);
  };

const gz = (files: Record<string, string | null>, ...names: string[]) =>
  names.reduce(
    (sum, name) => sum + gzipSync(Buffer.from(files[`static/chunks/${name}`]!)).length,
    0,
  );

describe("the page-weight report", () => {
  it("sums each page's first-load chunks and keeps the lazy chart chunk apart", () => {
    const files = fakeBuild();
    const report = measurePageWeights(reader(files));
    expect(report.buildId).toBe("fake-build");
    expect(report.routes.map((r) => r.route)).toEqual(["/lines", "/runs/[id]"]);
    const [lines, run] = report.routes;

    expect(run.isChartPage).toBe(true);
    expect(run.firstLoadFiles.sort()).toEqual(
      [
        "static/chunks/framework.js",
        "static/chunks/layout.js",
        "static/chunks/run.js",
        "static/chunks/turbopack-runtime.js",
      ].sort(),
    );
    // The polyfills (nomodule browsers only) and the chart chunk are not first-load JS.
    expect(run.firstLoadGzipBytes).toBe(
      gz(files, "framework.js", "turbopack-runtime.js", "layout.js", "run.js"),
    );
    expect(run.chartChunkFiles).toEqual(["static/chunks/plot.js"]);
    expect(run.chartChunkGzipBytes).toBe(gz(files, "plot.js"));
    expect(run.chartChunkGzipBytes).toBeGreaterThan(5_000);
    expect(run.limitKb).toBe(500);

    expect(lines.isChartPage).toBe(false);
    expect(lines.chartChunkFiles).toEqual([]);
    expect(lines.firstLoadGzipBytes).toBe(
      gz(files, "framework.js", "turbopack-runtime.js", "layout.js", "lines.js"),
    );
    expect(lines.limitKb).toBe(200);
    expect(report.problems).toEqual([]);

    const table = formatPageWeights(report);
    expect(table).toContain("/runs/[id]");
    expect(table).toMatch(
      new RegExp(`/runs/\\[id\\]\\s+${(run.firstLoadGzipBytes / 1000).toFixed(1)}\\s+`),
    );
    expect(table).toContain("Every page is within its budget.");
  });

  it("flags a page over its budget and a chart library in the first load", () => {
    const files = fakeBuild();
    const small = measurePageWeights(reader(files), { chartPage: 10, otherPage: 10 });
    expect(small.routes.every((r) => r.overLimit)).toBe(true);
    expect(small.problems).toHaveLength(2);
    expect(small.problems[0]).toMatch(/^\/lines loads \d+\.\d KB .* over its 10 KB budget\.$/);

    // The library bundled into the page's own chunk instead of a lazy one.
    const eager = fakeBuild({
      "static/chunks/run.js": `${incompressible(4_000, 5)};title:"${CHART_LIBRARY_SIGNATURE} png"`,
    });
    const report = measurePageWeights(reader(eager));
    const run = report.routes.find((r) => r.route === "/runs/[id]")!;
    expect(run.chartLibraryInFirstLoad).toBe(true);
    expect(run.isChartPage).toBe(true);
    expect(report.problems.join(" ")).toMatch(/\/runs\/\[id\] carries the charting library/);
    expect(formatPageWeights(report)).toContain("CHART LIB IN FIRST LOAD");
  });

  it.each([
    ["no BUILD_ID", { BUILD_ID: null }, /BUILD_ID/],
    ["no build manifest", { "build-manifest.json": null }, /build-manifest\.json is missing/],
    ["no framework chunks", { "build-manifest.json": "{}" }, /rootMainFiles/],
    [
      "no client reference manifest",
      { "server/app/(workspace)/lines/page_client-reference-manifest.js": null },
      /lines\/page_client-reference-manifest\.js is missing/,
    ],
    [
      "a manifest of another shape",
      { "server/app/(workspace)/lines/page_client-reference-manifest.js": "module.exports = {}" },
      /does not have the shape/,
    ],
    ["a listed chunk missing", { "static/chunks/lines.js": null }, /lines\.js is listed/],
    [
      "empty chunks",
      {
        "static/chunks/framework.js": "",
        "static/chunks/turbopack-runtime.js": "",
        "static/chunks/layout.js": "",
        "static/chunks/lines.js": "",
      },
      /empty/,
    ],
    ["no page routes", { "app-path-routes-manifest.json": "{}" }, /no page routes/],
  ])("refuses a build with %s instead of printing zeros", (_, overrides, message) => {
    expect(() => measurePageWeights(reader(fakeBuild(overrides)))).toThrow(PageWeightError);
    expect(() => measurePageWeights(reader(fakeBuild(overrides)))).toThrow(message);
  });

  it("reads the entries and the dynamic-import references the way Next 16 writes them", () => {
    const text = clientManifest("/x/page", {
      a: ["static/chunks/1.js"],
      b: ["static/chunks/1.js", "static/chunks/2.js"],
    });
    expect(entryChunksOf(text, "/x/page")).toEqual(["static/chunks/1.js", "static/chunks/2.js"]);
    expect(() => entryChunksOf(text, "/y/page")).toThrow(PageWeightError);
    expect(
      chunkReferences(
        `e.v(t=>Promise.all(["static/chunks/a.js","static/chunks/b.js"].map(t=>e.l(t))))`,
      ),
    ).toEqual(["static/chunks/a.js", "static/chunks/b.js"]);
  });
});

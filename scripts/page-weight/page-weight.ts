// The page-weight report's reading of a Next.js 16 (Turbopack) production build: for each page route,
// the gzipped JavaScript a browser fetches on first load and, apart from it, the lazily loaded chunk
// that holds the charting library. bench/page-weight-bench.ts prints it; the parts here read files
// through a small reader so a test can hand them a fake build.
import { gzipSync } from "node:zlib";

/** The first-load budgets of issue 14 (item 6), in KB of gzip (1 KB = 1,000 bytes). */
export const PAGE_WEIGHT_LIMITS_KB = { chartPage: 500, otherPage: 200 } as const;

/**
 * Text only the charting library holds: the title of Plotly's PNG button in its modebar (the browser
 * tests look for the same button). A chunk that contains it is the chart chunk.
 */
export const CHART_LIBRARY_SIGNATURE = "Download plot as a";

/** Reads a file of the build folder (paths relative to it, "/" separated); null when missing. */
export type BuildReader = (relativePath: string) => Buffer | null;

export interface RouteWeight {
  /** The URL pattern, e.g. "/runs/[id]". */
  route: string;
  /** The App Router entry, e.g. "/(workspace)/runs/[id]/page". */
  entry: string;
  /** Chunks a first visit fetches: the runtime and framework chunks and every entry of the route. */
  firstLoadFiles: string[];
  firstLoadGzipBytes: number;
  /** Chunks fetched later by a dynamic import of the route's code that hold the charting library. */
  chartChunkFiles: string[];
  chartChunkGzipBytes: number;
  /** The route draws a chart: its code can load the chart chunk. */
  isChartPage: boolean;
  /** The charting library sits in the first load itself (what the lazy loading is there to prevent). */
  chartLibraryInFirstLoad: boolean;
  limitKb: number;
  overLimit: boolean;
}

export interface PageWeightReport {
  buildId: string;
  routes: RouteWeight[];
  /** Sentences naming each route over its budget or with the charting library in its first load. */
  problems: string[];
}

const CHUNK_REFERENCE = /"(static\/chunks\/[^"\\]+\.js)"/g;
const MANIFEST_ASSIGNMENT = /__RSC_MANIFEST\[("(?:[^"\\]|\\.)*")\]\s*=\s*(\{[\s\S]*\})\s*;?\s*$/;

export class PageWeightError extends Error {}

function readJson<T>(read: BuildReader, file: string): T {
  const bytes = read(file);
  if (!bytes)
    throw new PageWeightError(
      `${file} is missing: build the app first (npm run bench -- --pages --build).`,
    );
  try {
    return JSON.parse(bytes.toString("utf8")) as T;
  } catch {
    throw new PageWeightError(`${file} is not JSON: the build looks incomplete; build it again.`);
  }
}

/** The JS chunks of every entry (layouts, boundaries, the page) in a route's client reference manifest. */
export function entryChunksOf(manifestText: string, entry: string): string[] {
  const match = MANIFEST_ASSIGNMENT.exec(manifestText.trim());
  if (!match || JSON.parse(match[1]) !== entry)
    throw new PageWeightError(
      `The client reference manifest of ${entry} does not have the shape this report reads (Next.js 16's __RSC_MANIFEST assignment).`,
    );
  const manifest = JSON.parse(match[2]) as { entryJSFiles?: Record<string, string[]> };
  if (!manifest.entryJSFiles || typeof manifest.entryJSFiles !== "object")
    throw new PageWeightError(`The client reference manifest of ${entry} lists no entryJSFiles.`);
  return [...new Set(Object.values(manifest.entryJSFiles).flat())];
}

/** Chunks a chunk loads by a dynamic import (Turbopack writes their paths as string literals). */
export function chunkReferences(chunkText: string): string[] {
  return [...new Set([...chunkText.matchAll(CHUNK_REFERENCE)].map((m) => m[1]))];
}

export function measurePageWeights(
  read: BuildReader,
  limitsKb: { chartPage: number; otherPage: number } = PAGE_WEIGHT_LIMITS_KB,
): PageWeightReport {
  const buildId = read("BUILD_ID")?.toString("utf8").trim();
  if (!buildId) throw new PageWeightError("BUILD_ID is missing: this is not a production build.");
  const buildManifest = readJson<{ rootMainFiles?: string[] }>(read, "build-manifest.json");
  // polyfillFiles are left out: they load only in browsers without ES modules (nomodule).
  const rootMainFiles = buildManifest.rootMainFiles ?? [];
  if (rootMainFiles.length === 0)
    throw new PageWeightError("build-manifest.json lists no rootMainFiles (the framework chunks).");
  const routesByEntry = readJson<Record<string, string>>(read, "app-path-routes-manifest.json");

  const texts = new Map<string, string>();
  const gzipSizes = new Map<string, number>();
  const text = (chunk: string): string => {
    let value = texts.get(chunk);
    if (value === undefined) {
      const bytes = read(chunk);
      if (!bytes) throw new PageWeightError(`${chunk} is listed by the build but missing from it.`);
      value = bytes.toString("utf8");
      texts.set(chunk, value);
      // Node's default gzip level, the one `next start` compresses with.
      gzipSizes.set(chunk, gzipSync(bytes).length);
    }
    return value;
  };
  const gzipBytes = (chunks: string[]) =>
    chunks.reduce((sum, chunk) => {
      text(chunk);
      return sum + gzipSizes.get(chunk)!;
    }, 0);
  const holdsChartLibrary = (chunk: string) => text(chunk).includes(CHART_LIBRARY_SIGNATURE);

  const routes: RouteWeight[] = [];
  const problems: string[] = [];
  for (const [entry, route] of Object.entries(routesByEntry).sort((a, b) =>
    a[1].localeCompare(b[1]),
  )) {
    if (!entry.endsWith("/page")) continue; // route handlers and metadata files send no page JS
    const manifestFile = `server/app${entry}_client-reference-manifest.js`;
    const manifestText = read(manifestFile);
    if (!manifestText)
      throw new PageWeightError(`${manifestFile} is missing: the build looks incomplete.`);
    const firstLoad = new Set([...rootMainFiles, ...entryChunksOf(manifestText.toString(), entry)]);
    // Everything reachable through dynamic imports, however deep, that the first load does not hold.
    const lazy = new Set<string>();
    const queue = [...firstLoad];
    while (queue.length > 0) {
      for (const next of chunkReferences(text(queue.pop()!)))
        if (!firstLoad.has(next) && !lazy.has(next) && read(next)) {
          lazy.add(next);
          queue.push(next);
        }
    }
    const firstLoadFiles = [...firstLoad];
    const chartChunkFiles = [...lazy].filter(holdsChartLibrary).sort();
    const chartLibraryInFirstLoad = firstLoadFiles.some(holdsChartLibrary);
    const isChartPage = chartChunkFiles.length > 0 || chartLibraryInFirstLoad;
    const firstLoadGzipBytes = gzipBytes(firstLoadFiles);
    if (firstLoadFiles.every((chunk) => text(chunk).length === 0))
      throw new PageWeightError(`${route}: its first-load chunks are empty files.`);
    const limitKb = isChartPage ? limitsKb.chartPage : limitsKb.otherPage;
    const overLimit = firstLoadGzipBytes > limitKb * 1000;
    if (overLimit)
      problems.push(
        `${route} loads ${kb(firstLoadGzipBytes)} KB of gzipped JavaScript first, over its ${limitKb} KB budget.`,
      );
    if (chartLibraryInFirstLoad)
      problems.push(
        `${route} carries the charting library in its first load instead of loading it when a chart is shown.`,
      );
    routes.push({
      route,
      entry,
      firstLoadFiles,
      firstLoadGzipBytes,
      chartChunkFiles,
      chartChunkGzipBytes: gzipBytes(chartChunkFiles),
      isChartPage,
      chartLibraryInFirstLoad,
      limitKb,
      overLimit,
    });
  }
  if (routes.length === 0)
    throw new PageWeightError("app-path-routes-manifest.json lists no page routes.");
  return { buildId, routes, problems };
}

/** Bytes as KB with one decimal, for the report. */
export function kb(bytes: number): string {
  return (bytes / 1000).toFixed(1);
}

/** The report as a fixed-width table with its problems under it. */
export function formatPageWeights(report: PageWeightReport): string {
  const header = ["route", "first-load JS (KB gzip)", "chart chunk (KB gzip)", "budget", ""];
  const rows = report.routes.map((r) => [
    r.route,
    kb(r.firstLoadGzipBytes),
    r.isChartPage ? kb(r.chartChunkGzipBytes) : "–",
    `${r.limitKb} KB`,
    r.overLimit ? "OVER" : r.chartLibraryInFirstLoad ? "CHART LIB IN FIRST LOAD" : "ok",
  ]);
  const widths = header.map((h, i) => Math.max(h.length, ...rows.map((row) => row[i].length)));
  const line = (cells: string[]) =>
    cells
      .map((c, i) => (i === 0 ? c.padEnd(widths[i]) : c.padStart(widths[i])))
      .join("  ")
      .trimEnd();
  return [
    `Page weight of build ${report.buildId} (gzip, 1 KB = 1,000 bytes; the chart chunk loads only where a chart is shown)`,
    line(header),
    ...rows.map(line),
    ...(report.problems.length
      ? ["", ...report.problems]
      : ["", "Every page is within its budget."]),
  ].join("\n");
}

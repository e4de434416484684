"use client";
// A chart of the workflow pages: a figure of the chart's exact height that shows a skeleton while the
// charting library loads (components/charts/plot-loader.ts: once per page, only where a chart is), then
// the Plotly chart, or a sentence and a reload button when the library did not arrive. Every chart keeps
// the modebar (zoom, pan, PNG export) and nothing that sends a chart outside (lib/charts/chart-config.ts).
import type { Data, Layout, PlotMouseEvent } from "plotly.js";
import { useEffect, useState } from "react";
import { chartConfig } from "@/lib/charts/chart-config";
import { Button } from "@/components/ui/button";
import { loadPlotComponent, type PlotComponent } from "./plot-loader";

type LoadState =
  | { status: "loading" }
  | { status: "ready"; Plot: PlotComponent }
  | { status: "failed"; reason: string };

/**
 * The Plotly component once the shared loader has it. Every chart starts "loading", as the server drew
 * it, even when the library is already here (a chart hydrated late, or a page reached by a link): the
 * loader's settled promise then answers at once, so the skeleton shows for a frame at most.
 */
function usePlotComponent(): LoadState {
  const [state, setState] = useState<LoadState>({ status: "loading" });
  const ready = state.status === "ready";
  useEffect(() => {
    if (ready) return;
    let mounted = true;
    loadPlotComponent().then(
      (Plot) => mounted && setState({ status: "ready", Plot }),
      (error: unknown) =>
        mounted &&
        setState({
          status: "failed",
          reason: error instanceof Error && error.message ? error.message : String(error),
        }),
    );
    return () => {
      mounted = false;
    };
  }, [ready]);
  return state;
}

/** Holds the chart's place (same height, so nothing below moves) and says what is coming. */
function ChartSkeleton() {
  return (
    <div
      role="status"
      aria-live="polite"
      data-testid="chart-skeleton"
      className="flex h-full items-center justify-center rounded bg-ink-100/60 motion-safe:animate-pulse dark:bg-ink-800/60"
    >
      <span className="muted text-sm">Loading chart…</span>
    </div>
  );
}

function ChartUnavailable({ reason }: { reason: string }) {
  return (
    <div
      role="alert"
      data-testid="chart-error"
      className="flex h-full flex-col items-center justify-center gap-2 rounded border border-dashed border-[var(--line)] p-4 text-center text-sm"
    >
      <p>
        The chart could not be shown: the charting code did not arrive from the server. The rest of
        the page is complete; reloading it usually brings the chart.
      </p>
      <details className="muted text-xs">
        <summary className="cursor-pointer">Technical detail</summary>
        {reason}
      </details>
      <Button type="button" variant="quiet" onClick={() => window.location.reload()}>
        Reload the page
      </Button>
    </div>
  );
}

/** How many points a thinned spectrum kept of how many. */
export interface Thinning {
  shown: number;
  of: number;
}

/** The thinning of a series that says how many points it came from, or null when none was dropped. */
export function thinningOf(series: {
  x: ArrayLike<number>;
  sourcePoints?: number;
}): Thinning | null {
  return series.sourcePoints !== undefined && series.sourcePoints > series.x.length
    ? { shown: series.x.length, of: series.sourcePoints }
    : null;
}

/** Okabe–Ito colours (colour-blind safe); each series also has its own marker shape and a legend label. */
export const SERIES = {
  spectrum: "#0072B2",
  marks: "#D55E00",
  used: "#009E73",
  rejected: "#CC79A7",
  other: "#E69F00",
} as const;

const AXIS = {
  gridcolor: "rgba(128,128,128,0.25)",
  zerolinecolor: "rgba(128,128,128,0.5)",
  linecolor: "rgba(128,128,128,0.6)",
};

export function Chart({
  data,
  layout = {},
  title,
  height = 380,
  fileName,
  caption,
  onPointClick,
  name,
  thinned = null,
}: {
  data: Data[];
  layout?: Partial<Layout>;
  /** What the chart shows, for screen readers (the tables beside it carry the same numbers). */
  title: string;
  height?: number;
  /** Name of the PNG the modebar's camera button saves. */
  fileName: string;
  /** What a click does, said under the chart (with onPointClick). */
  caption?: string;
  onPointClick?: (event: PlotMouseEvent) => void;
  /** Names the chart for tests and styles (data-chart). */
  name?: string;
  /** The spectrum drawn was thinned for the browser (lib/charts/thin-series.ts): said in the caption. */
  thinned?: Thinning | null;
}) {
  const load = usePlotComponent();
  return (
    <figure
      role="figure"
      aria-label={title}
      aria-busy={load.status === "loading"}
      className="panel p-2"
      data-testid="chart"
      data-chart={name}
    >
      <div style={{ height }}>
        {load.status === "loading" ? (
          <ChartSkeleton />
        ) : load.status === "failed" ? (
          <ChartUnavailable reason={load.reason} />
        ) : (
          <load.Plot
            data={data}
            layout={{
              autosize: true,
              margin: { l: 60, r: 16, t: 16, b: 48 },
              paper_bgcolor: "rgba(0,0,0,0)",
              plot_bgcolor: "rgba(0,0,0,0)",
              font: { family: "IBM Plex Sans, system-ui, sans-serif", size: 12, color: "#8f8b7f" },
              legend: { orientation: "h", y: -0.2 },
              hovermode: "closest",
              // Zoom and pan survive new data (a changed view or a refitted preview).
              uirevision: "keep",
              ...layout,
              xaxis: { ...AXIS, ...layout.xaxis },
              yaxis: { ...AXIS, ...layout.yaxis },
            }}
            config={chartConfig(fileName)}
            onClick={onPointClick}
            useResizeHandler
            style={{ width: "100%", height: "100%" }}
          />
        )}
      </div>
      <figcaption className="muted px-2 pt-1 text-xs">
        {title}. {caption ? `${caption} ` : ""}Drag to zoom, double-click to reset; the camera
        button saves a PNG.
        {thinned ? (
          <span data-testid="chart-thinned">
            {" "}
            The line is drawn from {thinned.shown.toLocaleString("en")} of the spectrum&apos;s{" "}
            {thinned.of.toLocaleString("en")} points: each stretch keeps its lowest and highest
            count, so no peak is lost, but zooming in shows no finer detail. The stored spectrum and
            its analysis keep every point.
          </span>
        ) : null}
      </figcaption>
    </figure>
  );
}

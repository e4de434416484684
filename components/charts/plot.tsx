"use client";
// Plotly for the App Router: plotly.js touches `window` when it loads, so the factory and the min
// bundle are loaded in the browser only. Every chart keeps the modebar (zoom, pan, PNG export) and
// nothing that sends a chart outside (lib/charts/chart-config.ts).
import dynamic from "next/dynamic";
import type { Data, Layout, PlotMouseEvent } from "plotly.js";
import type { PlotParams } from "react-plotly.js";
import { chartConfig } from "@/lib/charts/chart-config";

const Plot = dynamic<PlotParams>(
  async () => {
    const [{ default: createPlotComponent }, plotly] = await Promise.all([
      import("react-plotly.js/factory"),
      import("plotly.js-dist-min"),
    ]);
    return createPlotComponent((plotly as { default?: object }).default ?? plotly);
  },
  {
    ssr: false,
    loading: () => (
      <p role="status" className="muted flex h-full items-center justify-center text-sm">
        Loading the chart…
      </p>
    ),
  },
);

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
}) {
  return (
    <figure
      role="figure"
      aria-label={title}
      className="panel p-2"
      data-testid="chart"
      data-chart={name}
    >
      <div style={{ height }}>
        <Plot
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
      </div>
      <figcaption className="muted px-2 pt-1 text-xs">
        {title}. {caption ? `${caption} ` : ""}Drag to zoom, double-click to reset; the camera
        button saves a PNG.
      </figcaption>
    </figure>
  );
}

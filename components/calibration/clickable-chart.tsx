"use client";
// A Plotly chart whose points can be clicked (the shared Chart in components/charts has no click
// handler): the same lazy browser-only load, our axis style and the modebar for zoom and PNG export.
import dynamic from "next/dynamic";
import type { Data, Layout, PlotMouseEvent } from "plotly.js";
import type { PlotParams } from "react-plotly.js";

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

const AXIS = { gridcolor: "rgba(128,128,128,0.25)", zerolinecolor: "rgba(128,128,128,0.5)", linecolor: "rgba(128,128,128,0.6)" };

export function ClickableChart({
  data,
  layout = {},
  title,
  caption,
  height = 380,
  fileName,
  onPointClick,
  name,
}: {
  data: Data[];
  layout?: Partial<Layout>;
  /** What the chart shows, for screen readers (the tables beside it carry the same numbers). */
  title: string;
  /** What a click does, said under the chart. */
  caption?: string;
  height?: number;
  fileName: string;
  onPointClick?: (event: PlotMouseEvent) => void;
  /** Names the chart for tests and styles (data-chart). */
  name: string;
}) {
  return (
    <figure role="figure" aria-label={title} className="panel p-2" data-testid="chart" data-chart={name}>
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
            uirevision: "keep",
            ...layout,
            xaxis: { ...AXIS, ...layout.xaxis },
            yaxis: { ...AXIS, ...layout.yaxis },
          }}
          config={{
            responsive: true,
            displaylogo: false,
            toImageButtonOptions: { format: "png", filename: fileName, scale: 2 },
          }}
          onClick={onPointClick}
          useResizeHandler
          style={{ width: "100%", height: "100%" }}
        />
      </div>
      <figcaption className="muted px-2 pt-1 text-xs">
        {title}. {caption ? `${caption} ` : ""}Drag to zoom, double-click to reset; the camera button saves a PNG.
      </figcaption>
    </figure>
  );
}

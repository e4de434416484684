// Loads the charting library once per page, only when a chart is on it: the first chart that mounts
// starts the download (Plotly's basic bundle and the React wrapper, ~400 KB gzip) and every other chart
// on the page waits for the same promise. Nothing here runs on the server: plotly.js touches `window`
// as it loads, so the import happens in an effect (components/charts/plot.tsx).
import type { ComponentType } from "react";
import type { PlotParams } from "react-plotly.js";

export type PlotComponent = ComponentType<PlotParams>;

let pending: Promise<PlotComponent> | null = null;

/** The Plotly React component, downloading the library on the first call of the page. */
export function loadPlotComponent(): Promise<PlotComponent> {
  pending ??= Promise.all([import("react-plotly.js/factory"), import("plotly.js-basic-dist-min")])
    .then(([factory, plotly]) => {
      return factory.default((plotly as { default?: object }).default ?? plotly);
    })
    .catch((error: unknown) => {
      // Forget the failure, so a later chart asks again (the bundler may still refuse a chunk it
      // failed to load once: the chart's error offers a reload of the page).
      pending = null;
      throw error;
    });
  return pending;
}

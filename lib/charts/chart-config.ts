// The one Plotly config every chart uses: the lab's data stays in the lab. Plotly 4 offers "Share
// chart…" (upload to its cloud service) by default, and its logo and the older edit/send links point
// outside too; every such control and link is off, and the modebar keeps zoom, pan and PNG export.
import type { Config, ModeBarDefaultButtons } from "plotly.js";

/**
 * Modebar buttons that send a chart or its data to an outside service: Plotly 4's "Share chart…"
 * and the name the same button had before (the types know only the current one).
 */
export const OUTSIDE_SERVICE_BUTTONS = [
  "sendChartToCloud",
  "sendDataToCloud",
] as unknown as ModeBarDefaultButtons[];

/** Keys of older Plotly versions that put a "send to the cloud" link under the chart; Plotly 4 ignores them. */
const LEGACY_LINK_KEYS = {
  showLink: false,
  sendData: false,
  linkText: "",
  showEditInChartStudio: false,
} as Partial<Config>;

export function chartConfig(fileName: string): Partial<Config> {
  return {
    ...LEGACY_LINK_KEYS,
    responsive: true,
    displaylogo: false,
    showSendToCloud: false,
    // No destination even if a future Plotly adds a sharing control that these flags do not cover.
    plotlyServerURL: "",
    modeBarButtonsToRemove: OUTSIDE_SERVICE_BUTTONS,
    showTips: false,
    toImageButtonOptions: { format: "png", filename: fileName, scale: 2 },
  };
}

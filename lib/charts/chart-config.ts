// The one Plotly config every chart uses: the lab's data stays in the lab. Plotly 4 offers "Share
// chart…" (upload to its cloud service) by default, and its logo and the older edit/send links point
// outside too; every such control and link is off, and the modebar keeps zoom, pan and PNG export.
import type { Config, ModeBarDefaultButtons } from "plotly.js";

/** Modebar buttons that send a chart or its data to an outside service (names of Plotly 2 to 4). */
export const OUTSIDE_SERVICE_BUTTONS: ModeBarDefaultButtons[] = ["sendDataToCloud", "sendChartToCloud"];

export function chartConfig(fileName: string): Partial<Config> {
  return {
    responsive: true,
    displaylogo: false,
    showLink: false,
    sendData: false,
    linkText: "",
    showSendToCloud: false,
    showEditInChartStudio: false,
    // No destination even if a future Plotly adds a sharing control that these flags do not cover.
    plotlyServerURL: "",
    modeBarButtonsToRemove: OUTSIDE_SERVICE_BUTTONS,
    showTips: false,
    toImageButtonOptions: { format: "png", filename: fileName, scale: 2 },
  };
}

// The one chart config keeps the lab's data in the lab: no "Share chart…" button, no logo link, no
// send-data link, and no outside server for Plotly to send to, whatever the file name.
import { describe, expect, it } from "vitest";
import { chartConfig, OUTSIDE_SERVICE_BUTTONS } from "@/lib/charts/chart-config";

describe("chartConfig", () => {
  const config = chartConfig("lamp-calibration") as Record<string, unknown>;

  it("turns off every control and link that points outside", () => {
    expect(config.showSendToCloud).toBe(false);
    expect(config.showEditInChartStudio).toBe(false);
    expect(config.showLink).toBe(false);
    expect(config.sendData).toBe(false);
    expect(config.displaylogo).toBe(false);
    expect(config.plotlyServerURL).toBe("");
    expect(config.modeBarButtonsToRemove).toEqual(
      expect.arrayContaining(["sendChartToCloud", "sendDataToCloud"]),
    );
    expect(OUTSIDE_SERVICE_BUTTONS).toEqual(["sendChartToCloud", "sendDataToCloud"]);
  });

  it("keeps the PNG export under the chart's own file name", () => {
    expect(config.toImageButtonOptions).toEqual({
      format: "png",
      filename: "lamp-calibration",
      scale: 2,
    });
  });

  it("names no outside address anywhere in the config", () => {
    expect(JSON.stringify(config)).not.toMatch(/https?:\/\//);
  });
});

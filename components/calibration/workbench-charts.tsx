"use client";
// The workbench's two charts: the lamp spectrum with its peaks marked (paired ones labelled with their
// line, unpaired ones clickable to pair), and the residuals per pair (excluded pairs drawn apart).
// Each series has its own marker shape and a legend label, so nothing is told by colour alone.
import type { Data } from "plotly.js";
import { Chart, SERIES, thinningOf } from "@/components/charts/plot";
import { labelLanesMarginPx, staggeredLabelAnnotations } from "@/lib/charts/stagger-labels";
import type { SpectrumSeries } from "@/components/charts/spectrum-charts";
import type { CalibrationPreview } from "@/lib/services/calibrations";

/** The counts nearest a pixel, so a mark sits on its peak. */
function countsAt(series: SpectrumSeries, x: number): number {
  let best = 0;
  for (let i = 1; i < series.x.length; i++)
    if (Math.abs(series.x[i] - x) < Math.abs(series.x[best] - x)) best = i;
  return series.y[best] ?? 0;
}

const lineLabel = (species: string | null, wavelengthNm: number) =>
  `${species ?? ""} ${wavelengthNm.toFixed(2)}`.trim();

export function WorkbenchLampChart({
  spectrum,
  preview,
  xTitle,
  onPeakClick,
}: {
  spectrum: SpectrumSeries;
  preview: CalibrationPreview;
  xTitle: string;
  /** Called with the index (in preview.peaks) of an unpaired peak the chemist clicked. */
  onPeakClick: (peakIndex: number) => void;
}) {
  const pairs = preview.result.pairs;
  const marks = (state: "used" | "rejected" | "excluded"): Data => {
    const chosen = pairs.filter((p) => p.state === state);
    const style = (
      {
        used: { name: "Paired line (in the fit)", symbol: "triangle-down", color: SERIES.used },
        rejected: {
          name: "Paired line (rejected by the fit)",
          symbol: "x",
          color: SERIES.rejected,
        },
        excluded: {
          name: "Paired line (excluded by hand)",
          symbol: "diamond-open",
          color: SERIES.other,
        },
      } as const
    )[state];
    return {
      type: "scatter",
      mode: "markers",
      name: style.name,
      x: chosen.map((p) => p.pixel),
      y: chosen.map((p) => countsAt(spectrum, p.pixel)),
      text: chosen.map((p) => lineLabel(p.species, p.wavelengthNm)),
      marker: { symbol: style.symbol, size: 9, color: style.color },
      hovertemplate: `pixel %{x:.2f}<br>%{text} nm<br>${state}<extra></extra>`,
    };
  };
  // Labels in lanes so none overlaps; a dense group's labels are read on hover.
  const labels = staggeredLabelAnnotations(
    pairs.map((p) => ({
      x: p.pixel,
      text: lineLabel(p.species, p.wavelengthNm),
    })),
    [spectrum.x[0] ?? 0, spectrum.x[spectrum.x.length - 1] ?? 1],
  );
  const unpaired = preview.peaks.map((p, i) => ({ ...p, i })).filter((p) => !p.pairedWith);
  return (
    <Chart
      name="lamp"
      title="Lamp spectrum with the paired lines labelled and the unpaired peaks circled"
      caption="Click a circled peak to pair it with a line."
      fileName="lamp-workbench"
      thinned={thinningOf(spectrum)}
      data={[
        {
          type: "scatter",
          mode: "lines",
          name: "Lamp counts",
          x: spectrum.x,
          y: spectrum.y,
          line: { color: SERIES.spectrum, width: 1 },
          hoverinfo: "skip",
        },
        marks("used"),
        marks("rejected"),
        marks("excluded"),
        {
          type: "scatter",
          mode: "markers",
          name: "Unpaired peak (click to pair)",
          x: unpaired.map((p) => p.pixel),
          y: unpaired.map((p) => countsAt(spectrum, p.pixel)),
          customdata: unpaired.map((p) => p.i),
          text: unpaired.map((p) =>
            p.predictedNm === null ? "outside the model" : `≈ ${p.predictedNm.toFixed(2)} nm`,
          ),
          marker: { symbol: "circle-open", size: 13, color: SERIES.marks, line: { width: 2 } },
          hovertemplate:
            "unpaired peak at pixel %{x:.2f}<br>%{text}<br>click to pair<extra></extra>",
        },
      ]}
      layout={{
        xaxis: { title: { text: xTitle } },
        yaxis: { title: { text: "Counts" } },
        annotations: labels,
        margin: { l: 60, r: 16, t: labelLanesMarginPx(), b: 48 },
      }}
      onPointClick={(event) => {
        const point = event.points?.[0];
        if (!point) return;
        const index = typeof point.customdata === "number" ? point.customdata : null;
        if (index !== null) {
          onPeakClick(index);
          return;
        }
        // A click on the spectrum near an unpaired peak picks that peak.
        const x = Number(point.x);
        const near = unpaired
          .map((p) => ({ p, d: Math.abs(p.pixel - x) }))
          .sort((a, b) => a.d - b.d)[0];
        if (near && near.d <= Math.max(3, 2 * near.p.fwhm)) onPeakClick(near.p.i);
      }}
    />
  );
}

export function WorkbenchResidualChart({
  preview,
  xTitle,
}: {
  preview: CalibrationPreview;
  xTitle: string;
}) {
  const series = (state: "used" | "rejected" | "excluded"): Data => {
    const chosen = preview.result.pairs.filter((p) => p.state === state);
    const style = (
      {
        used: { name: "Used pair", symbol: "circle", color: SERIES.used },
        rejected: { name: "Rejected by the fit", symbol: "x", color: SERIES.rejected },
        excluded: { name: "Excluded by hand", symbol: "diamond-open", color: SERIES.other },
      } as const
    )[state];
    return {
      type: "scatter",
      mode: "markers",
      name: style.name,
      x: chosen.map((p) => p.pixel),
      y: chosen.map((p) => p.residualNm),
      text: chosen.map(
        (p) =>
          `${lineLabel(p.species, p.wavelengthNm)} nm${p.origin === "added" ? " (paired by hand)" : ""}`,
      ),
      marker: { symbol: style.symbol, size: 9, color: style.color },
      hovertemplate: "pixel %{x:.2f}<br>%{text}<br>residual %{y:.4f} nm<extra></extra>",
    };
  };
  return (
    <Chart
      name="residuals"
      title="Residuals (line wavelength minus calibrated wavelength) against pixel"
      fileName="calibration-residuals"
      height={260}
      data={[series("used"), series("rejected"), series("excluded")]}
      layout={{
        xaxis: { title: { text: xTitle } },
        yaxis: { title: { text: "Residual (nm)" }, zeroline: true },
      }}
    />
  );
}

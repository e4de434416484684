"use client";
// The workflow's charts: a lamp spectrum with its paired lines, the calibration residuals, and a
// sample's calibrated spectrum with the identified lines labelled by species. Every series has its
// own marker shape and a legend label, so no series is told apart by colour alone.
import type { Data } from "plotly.js";
import { Chart, SERIES } from "./plot";

export interface SpectrumSeries {
  x: number[];
  y: number[];
}

/** The counts nearest to a position on the x axis (x sorted either way), so a mark sits on its peak. */
function countsAt(series: SpectrumSeries, x: number): number {
  let best = 0;
  for (let i = 1; i < series.x.length; i++) if (Math.abs(series.x[i] - x) < Math.abs(series.x[best] - x)) best = i;
  return series.y[best] ?? 0;
}

export interface PairMark {
  pixel: number;
  wavelengthNm: number;
  residualNm: number;
  species: string | null;
  used: boolean;
}

export function LampChart({ spectrum, pairs, xTitle }: { spectrum: SpectrumSeries; pairs: PairMark[]; xTitle: string }) {
  const mark = (used: boolean): Data => {
    const chosen = pairs.filter((p) => p.used === used);
    return {
      type: "scatter",
      mode: "text+markers",
      name: used ? "Paired line (used in the fit)" : "Paired line (rejected)",
      x: chosen.map((p) => p.pixel),
      y: chosen.map((p) => countsAt(spectrum, p.pixel)),
      text: chosen.map((p) => `${p.species ?? ""} ${p.wavelengthNm.toFixed(2)}`.trim()),
      textposition: "top center",
      textfont: { size: 10 },
      marker: { symbol: used ? "triangle-down" : "x", size: 9, color: used ? SERIES.used : SERIES.rejected },
      hovertemplate: "pixel %{x:.2f}<br>%{text} nm<extra></extra>",
    };
  };
  return (
    <Chart
      title="Lamp spectrum with the paired lines marked"
      fileName="lamp-calibration"
      data={[
        { type: "scatter", mode: "lines", name: "Lamp counts", x: spectrum.x, y: spectrum.y, line: { color: SERIES.spectrum, width: 1 } },
        mark(true),
        mark(false),
      ]}
      layout={{ xaxis: { title: { text: xTitle } }, yaxis: { title: { text: "Counts" } } }}
    />
  );
}

export function ResidualChart({ pairs, xTitle }: { pairs: PairMark[]; xTitle: string }) {
  const series = (used: boolean): Data => {
    const chosen = pairs.filter((p) => p.used === used);
    return {
      type: "scatter",
      mode: "markers",
      name: used ? "Used pair" : "Rejected pair",
      x: chosen.map((p) => p.pixel),
      y: chosen.map((p) => p.residualNm),
      text: chosen.map((p) => `${p.species ?? ""} ${p.wavelengthNm.toFixed(3)} nm`.trim()),
      marker: { symbol: used ? "circle" : "x", size: 8, color: used ? SERIES.used : SERIES.rejected },
      hovertemplate: "pixel %{x:.2f}<br>%{text}<br>residual %{y:.4f} nm<extra></extra>",
    };
  };
  return (
    <Chart
      title="Residuals of the fit (line wavelength minus calibrated wavelength)"
      fileName="calibration-residuals"
      height={260}
      data={[series(true), series(false)]}
      layout={{ xaxis: { title: { text: xTitle } }, yaxis: { title: { text: "Residual (nm)" }, zeroline: true } }}
    />
  );
}

export interface LineLabel {
  peakNm: number;
  species: string;
  verdict: "present" | "possible";
}

export function RunSpectrumChart({
  spectrum,
  labels,
  unexplainedNm,
}: {
  spectrum: SpectrumSeries;
  labels: LineLabel[];
  unexplainedNm: number[];
}) {
  const marks = (verdict: LineLabel["verdict"]): Data => {
    const chosen = labels.filter((l) => l.verdict === verdict);
    return {
      type: "scatter",
      mode: "text+markers",
      name: verdict === "present" ? "Line of a species called present" : "Line of a species called possible",
      x: chosen.map((l) => l.peakNm),
      y: chosen.map((l) => countsAt(spectrum, l.peakNm)),
      text: chosen.map((l) => l.species),
      textposition: "top center",
      textfont: { size: 11 },
      marker: {
        symbol: verdict === "present" ? "triangle-down" : "diamond-open",
        size: 10,
        color: verdict === "present" ? SERIES.used : SERIES.other,
      },
      hovertemplate: "%{text}<br>%{x:.3f} nm<extra></extra>",
    };
  };
  return (
    <Chart
      title="Calibrated sample spectrum with the identified lines labelled"
      fileName="run-spectrum"
      height={420}
      data={[
        { type: "scatter", mode: "lines", name: "Sample counts", x: spectrum.x, y: spectrum.y, line: { color: SERIES.spectrum, width: 1 } },
        marks("present"),
        marks("possible"),
        {
          type: "scatter",
          mode: "markers",
          name: "Unexplained peak",
          x: unexplainedNm,
          y: unexplainedNm.map((nm) => countsAt(spectrum, nm)),
          marker: { symbol: "circle-open", size: 9, color: SERIES.marks },
          hovertemplate: "unexplained peak<br>%{x:.3f} nm<extra></extra>",
        },
      ]}
      layout={{ xaxis: { title: { text: "Wavelength (nm, air)" } }, yaxis: { title: { text: "Counts" } } }}
    />
  );
}

/** A quick look at parsed points right after an upload. */
export function PreviewChart({ spectrum, xTitle }: { spectrum: SpectrumSeries; xTitle: string }) {
  return (
    <Chart
      title="Preview of the parsed points"
      fileName="upload-preview"
      height={260}
      data={[{ type: "scatter", mode: "lines", name: "Counts", x: spectrum.x, y: spectrum.y, line: { color: SERIES.spectrum, width: 1 } }]}
      layout={{ showlegend: false, xaxis: { title: { text: xTitle } }, yaxis: { title: { text: "Counts" } } }}
    />
  );
}

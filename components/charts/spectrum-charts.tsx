"use client";
// The workflow's charts: a lamp spectrum with its paired lines, the calibration residuals, and a
// sample's calibrated spectrum with the identified lines labelled by species. Every series has its
// own marker shape and a legend label, so no series is told apart by colour alone.
import type { Data } from "plotly.js";
import { useId, useState } from "react";
import { labelLanesMarginPx, staggeredLabelAnnotations } from "@/lib/charts/stagger-labels";
import { BOLTZMANN_CONSTANT_EV_PER_K } from "@/lib/spectrum/temperature/boltzmann-constant";
import { Chart, SERIES, thinningOf } from "./plot";

export interface SpectrumSeries {
  x: number[];
  y: number[];
  /** Points before the series was thinned for the browser; absent when it was not. */
  sourcePoints?: number;
}

/** The counts nearest to a position on the x axis (x sorted either way), so a mark sits on its peak. */
function countsAt(series: SpectrumSeries, x: number): number {
  let best = 0;
  for (let i = 1; i < series.x.length; i++)
    if (Math.abs(series.x[i] - x) < Math.abs(series.x[best] - x)) best = i;
  return series.y[best] ?? 0;
}

export interface PairMark {
  pixel: number;
  wavelengthNm: number;
  residualNm: number;
  species: string | null;
  used: boolean;
}

export function LampChart({
  spectrum,
  pairs,
  xTitle,
}: {
  spectrum: SpectrumSeries;
  pairs: PairMark[];
  xTitle: string;
}) {
  const pairText = (p: PairMark) => `${p.species ?? ""} ${p.wavelengthNm.toFixed(2)}`.trim();
  // Labels in lanes so none overlaps; a dense group's labels are read on hover.
  const labels = staggeredLabelAnnotations(
    pairs.map((p) => ({ x: p.pixel, text: pairText(p) })),
    [spectrum.x[0] ?? 0, spectrum.x[spectrum.x.length - 1] ?? 1],
  );
  const mark = (used: boolean): Data => {
    const chosen = pairs.filter((p) => p.used === used);
    return {
      type: "scatter",
      mode: "markers",
      name: used ? "Paired line (used in the fit)" : "Paired line (rejected)",
      x: chosen.map((p) => p.pixel),
      y: chosen.map((p) => countsAt(spectrum, p.pixel)),
      text: chosen.map(pairText),
      marker: {
        symbol: used ? "triangle-down" : "x",
        size: 9,
        color: used ? SERIES.used : SERIES.rejected,
      },
      hovertemplate: "pixel %{x:.2f}<br>%{text} nm<extra></extra>",
    };
  };
  return (
    <Chart
      title="Lamp spectrum with the paired lines marked"
      fileName="lamp-calibration"
      thinned={thinningOf(spectrum)}
      data={[
        {
          type: "scatter",
          mode: "lines",
          name: "Lamp counts",
          x: spectrum.x,
          y: spectrum.y,
          line: { color: SERIES.spectrum, width: 1 },
        },
        mark(true),
        mark(false),
      ]}
      layout={{
        xaxis: { title: { text: xTitle } },
        yaxis: { title: { text: "Counts" } },
        annotations: labels,
        margin: { l: 60, r: 16, t: labelLanesMarginPx(), b: 48 },
      }}
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
      marker: {
        symbol: used ? "circle" : "x",
        size: 8,
        color: used ? SERIES.used : SERIES.rejected,
      },
      hovertemplate: "pixel %{x:.2f}<br>%{text}<br>residual %{y:.4f} nm<extra></extra>",
    };
  };
  return (
    <Chart
      title="Residuals of the fit (line wavelength minus calibrated wavelength)"
      fileName="calibration-residuals"
      height={260}
      data={[series(true), series(false)]}
      layout={{
        xaxis: { title: { text: xTitle } },
        yaxis: { title: { text: "Residual (nm)" }, zeroline: true },
      }}
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
  continuum = null,
  labels,
  unexplainedNm,
}: {
  spectrum: SpectrumSeries;
  /** The continuum the analysis removed, on spectrum.x; null hides the toggle. */
  continuum?: number[] | null;
  labels: LineLabel[];
  unexplainedNm: number[];
}) {
  const [view, setView] = useState<"raw" | "removed">("raw");
  const groupName = useId();
  const removed = view === "removed" && continuum !== null;
  const shown: SpectrumSeries = removed
    ? { x: spectrum.x, y: spectrum.y.map((y, i) => y - continuum![i]) }
    : spectrum;
  const marks = (verdict: LineLabel["verdict"]): Data => {
    const chosen = labels.filter((l) => l.verdict === verdict);
    return {
      type: "scatter",
      mode: "text+markers",
      name:
        verdict === "present"
          ? "Line of a species called present"
          : "Line of a species called possible",
      x: chosen.map((l) => l.peakNm),
      y: chosen.map((l) => countsAt(shown, l.peakNm)),
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
  const continuumTrace: Data[] =
    continuum !== null && !removed
      ? [
          {
            type: "scatter",
            mode: "lines",
            name: "Continuum (removed before peak finding)",
            x: spectrum.x,
            y: continuum,
            line: { color: SERIES.rejected, width: 1, dash: "dot" },
            hovertemplate: "continuum %{y:.0f}<extra></extra>",
          },
        ]
      : [];
  return (
    <div className="flex flex-col gap-2">
      {continuum !== null ? (
        <fieldset className="flex flex-wrap items-center gap-3 text-sm" data-testid="spectrum-view">
          <legend className="sr-only">Spectrum shown</legend>
          {(
            [
              ["raw", "Raw counts"],
              ["removed", "Continuum removed"],
            ] as const
          ).map(([value, label]) => (
            <label
              key={value}
              className="inline-flex cursor-pointer items-center gap-1.5 rounded border border-[var(--line)] px-2 py-1 has-[:checked]:border-ember-600 has-[:checked]:font-semibold has-[:focus-visible]:ring-2 has-[:focus-visible]:ring-ember-600"
            >
              <input
                type="radio"
                name={groupName}
                value={value}
                checked={view === value}
                onChange={() => setView(value)}
                className="accent-ember-600"
              />
              {label}
            </label>
          ))}
        </fieldset>
      ) : null}
      <Chart
        title={
          removed
            ? "Calibrated sample spectrum, continuum removed, with the identified lines labelled"
            : "Calibrated sample spectrum with the identified lines labelled"
        }
        fileName={removed ? "run-spectrum-continuum-removed" : "run-spectrum"}
        height={420}
        thinned={thinningOf(spectrum)}
        data={[
          {
            type: "scatter",
            mode: "lines",
            name: removed ? "Counts minus continuum" : "Sample counts",
            x: shown.x,
            y: shown.y,
            line: { color: SERIES.spectrum, width: 1 },
          },
          ...continuumTrace,
          marks("present"),
          marks("possible"),
          {
            type: "scatter",
            mode: "markers",
            name: "Unexplained peak",
            x: unexplainedNm,
            y: unexplainedNm.map((nm) => countsAt(shown, nm)),
            marker: { symbol: "circle-open", size: 9, color: SERIES.marks },
            hovertemplate: "unexplained peak<br>%{x:.3f} nm<extra></extra>",
          },
        ]}
        layout={{
          xaxis: { title: { text: "Wavelength (nm, air)" } },
          yaxis: { title: { text: removed ? "Counts above the continuum" : "Counts" } },
          // Keep the chemist's zoom when switching views.
          uirevision: "run-spectrum",
        }}
      />
    </div>
  );
}

/** A Boltzmann plot: ln(Iλ/gA) against the upper-level energy, with the fitted line. */
export function BoltzmannChart({
  points,
  temperatureK,
}: {
  points: { upperEv: number; y: number; wavelengthNm: number }[];
  temperatureK: number;
}) {
  // Slope −1/kT through the points' centroid: the line the fit found (same slope, least squares passes the centroid).
  const slope = -1 / (BOLTZMANN_CONSTANT_EV_PER_K * temperatureK);
  const meanX = points.reduce((s, p) => s + p.upperEv, 0) / points.length;
  const meanY = points.reduce((s, p) => s + p.y, 0) / points.length;
  const xs = [Math.min(...points.map((p) => p.upperEv)), Math.max(...points.map((p) => p.upperEv))];
  return (
    <Chart
      title="Boltzmann plot of the lines used for the temperature"
      fileName="boltzmann-plot"
      height={240}
      data={[
        {
          type: "scatter",
          mode: "markers",
          name: "Line",
          x: points.map((p) => p.upperEv),
          y: points.map((p) => p.y),
          text: points.map((p) => `${p.wavelengthNm.toFixed(3)} nm`),
          marker: { symbol: "circle", size: 8, color: SERIES.spectrum },
          hovertemplate: "%{text}<br>E = %{x:.3f} eV<br>ln(Iλ/gA) = %{y:.3f}<extra></extra>",
        },
        {
          type: "scatter",
          mode: "lines",
          name: "Fit",
          x: xs,
          y: xs.map((x) => meanY + slope * (x - meanX)),
          line: { color: SERIES.marks, width: 1, dash: "dash" },
          hoverinfo: "skip",
        },
      ]}
      layout={{
        xaxis: { title: { text: "Upper-level energy (eV)" } },
        yaxis: { title: { text: "ln(I·λ / g·A)" } },
      }}
    />
  );
}

/** A quick look at parsed points right after an upload. */
export function PreviewChart({ spectrum, xTitle }: { spectrum: SpectrumSeries; xTitle: string }) {
  return (
    <Chart
      title="Preview of the parsed points"
      fileName="upload-preview"
      thinned={thinningOf(spectrum)}
      height={260}
      data={[
        {
          type: "scatter",
          mode: "lines",
          name: "Counts",
          x: spectrum.x,
          y: spectrum.y,
          line: { color: SERIES.spectrum, width: 1 },
        },
      ]}
      layout={{
        showlegend: false,
        xaxis: { title: { text: xTitle } },
        yaxis: { title: { text: "Counts" } },
      }}
    />
  );
}

// The report's spectrum chart as plain geometry (axes, ticks in nm, the trace, line labels): the PDF
// renderer and the printable page's SVG both draw from it, so the two charts are the same picture.
import type { Verdict } from "@/lib/spectrum/matching";

export interface ChartLabelInput {
  peakNm: number;
  species: string[];
  verdict: Verdict;
}

export interface ChartGeometryOptions {
  /** Width of the whole chart, in drawing units (PDF points or SVG pixels). */
  width: number;
  /** Height of the whole chart. */
  height: number;
  /**
   * Font size of tick and line labels, used to estimate label widths.
   * @default 7
   */
  fontSize?: number;
  /**
   * Rows of line labels above the plot area, staggered so neighbouring labels do not overlap.
   * @default 3
   */
  labelRows?: number;
}

export interface ChartTick {
  value: number;
  /** Position along the axis in drawing units. */
  at: number;
  text: string;
}

export interface ChartLabel {
  text: string;
  verdict: Verdict;
  /** Where the label's leader starts (above the peak) and where the text sits. */
  peakX: number;
  peakY: number;
  textX: number;
  textY: number;
}

export interface ChartGeometry {
  plot: { left: number; top: number; right: number; bottom: number };
  xTicks: ChartTick[];
  yTicks: ChartTick[];
  xTitle: string;
  yTitle: string;
  /** The trace as [x, y] in drawing units, in order. */
  trace: [number, number][];
  labels: ChartLabel[];
  /** Labels that found no free place: the caption lists them instead. */
  unplaced: string[];
}

/** Tick values at 1, 2 or 5 × 10^k covering [min, max] with about `count` intervals. */
export function niceTicks(min: number, max: number, count = 6): number[] {
  if (!(Number.isFinite(min) && Number.isFinite(max)))
    throw new RangeError("tick range must be finite");
  if (max <= min) return [min];
  const raw = (max - min) / count;
  const power = 10 ** Math.floor(Math.log10(raw));
  const step = [1, 2, 5, 10].map((m) => m * power).find((s) => s >= raw) ?? 10 * power;
  const ticks: number[] = [];
  for (let v = Math.ceil(min / step - 1e-9) * step; v <= max + step * 1e-9; v += step)
    ticks.push(Number(v.toPrecision(12)));
  return ticks;
}

function tickText(value: number, ticks: number[]): string {
  const step = ticks.length > 1 ? ticks[1] - ticks[0] : 1;
  const decimals = Math.max(0, -Math.floor(Math.log10(step) + 1e-9));
  return value.toFixed(decimals);
}

export function chartGeometry(
  x: Float64Array,
  y: Float64Array,
  labelInputs: ChartLabelInput[],
  options: ChartGeometryOptions,
): ChartGeometry {
  const { width, height, fontSize = 7, labelRows = 3 } = options;
  if (x.length !== y.length) throw new RangeError(`x has ${x.length} values but y has ${y.length}`);
  if (x.length < 2) throw new RangeError("a chart needs at least 2 points");
  const rowHeight = fontSize * 1.35;
  const plot = {
    left: fontSize * 6,
    top: rowHeight * labelRows + fontSize * 0.8,
    right: width - fontSize,
    bottom: height - fontSize * 3.6,
  };
  const xMin = x[0];
  const xMax = x[x.length - 1];
  let yMin = Infinity;
  let yMax = -Infinity;
  for (let i = 0; i < y.length; i++) {
    yMin = Math.min(yMin, y[i]);
    yMax = Math.max(yMax, y[i]);
  }
  if (yMax === yMin) yMax = yMin + 1;
  const yTickValues = niceTicks(Math.min(0, yMin), yMax, 4);
  const yLow = Math.min(yTickValues[0], yMin);
  const yHigh = Math.max(yTickValues[yTickValues.length - 1], yMax) * 1.02;
  const px = (v: number) => plot.left + ((v - xMin) / (xMax - xMin)) * (plot.right - plot.left);
  const py = (v: number) => plot.bottom - ((v - yLow) / (yHigh - yLow)) * (plot.bottom - plot.top);

  const xTickValues = niceTicks(
    xMin,
    xMax,
    Math.max(3, Math.round((plot.right - plot.left) / (fontSize * 9))),
  );
  const xTicks = xTickValues.map((v) => ({ value: v, at: px(v), text: tickText(v, xTickValues) }));
  const yTicks = yTickValues
    .filter((v) => v >= yLow && v <= yHigh)
    .map((v) => ({ value: v, at: py(v), text: compactCount(v) }));
  const trace: [number, number][] = Array.from(x, (v, i) => [round2(px(v)), round2(py(y[i]))]);

  // Labels left to right; each takes the first row (nearest the plot) where it clears the previous label.
  const sorted = [...labelInputs]
    .filter((l) => l.peakNm >= xMin && l.peakNm <= xMax)
    .sort((a, b) => a.peakNm - b.peakNm);
  const rowEnds = new Array<number>(labelRows).fill(-Infinity);
  const labels: ChartLabel[] = [];
  const unplaced: string[] = [];
  for (const l of sorted) {
    const text = l.species.join(", ");
    const textWidth = text.length * fontSize * 0.55;
    const peakX = px(l.peakNm);
    const textX = Math.min(Math.max(peakX - textWidth / 2, plot.left), plot.right - textWidth);
    const row = rowEnds.findIndex((end) => textX > end + fontSize * 0.5);
    if (row < 0) {
      unplaced.push(`${text} ${l.peakNm.toFixed(2)} nm`);
      continue;
    }
    rowEnds[row] = textX + textWidth;
    labels.push({
      text,
      verdict: l.verdict,
      peakX,
      peakY: py(peakHeightNear(x, y, l.peakNm)),
      textX,
      textY: plot.top - fontSize * 0.6 - row * rowHeight,
    });
  }
  return {
    plot,
    xTicks,
    yTicks,
    xTitle: "Wavelength (nm)",
    yTitle: "Counts",
    trace,
    labels,
    unplaced,
  };
}

/** The highest count within a small window around a wavelength (the drawn top of that line). */
function peakHeightNear(x: Float64Array, y: Float64Array, nm: number): number {
  const window = (x[x.length - 1] - x[0]) / 400;
  let best = -Infinity;
  for (let i = 0; i < x.length; i++) if (Math.abs(x[i] - nm) <= window) best = Math.max(best, y[i]);
  if (best > -Infinity) return best;
  let nearest = 0;
  for (let i = 1; i < x.length; i++)
    if (Math.abs(x[i] - nm) < Math.abs(x[nearest] - nm)) nearest = i;
  return y[nearest];
}

function compactCount(v: number): string {
  const a = Math.abs(v);
  if (a >= 1e6) return `${Number((v / 1e6).toPrecision(3))}M`;
  if (a >= 1e4) return `${Number((v / 1e3).toPrecision(3))}k`;
  return String(Number(v.toPrecision(4)));
}

function round2(v: number): number {
  return Math.round(v * 100) / 100;
}

/** One label per peak from the calls: species sharing a peak share a label; absent calls get none. */
export function chartLabelsFromCalls(
  calls: { species: string; verdict: Verdict; lines: { peakNm: number }[] }[],
): ChartLabelInput[] {
  const byPeak = new Map<string, ChartLabelInput>();
  for (const c of calls) {
    if (c.verdict === "absent") continue;
    for (const l of c.lines) {
      const key = l.peakNm.toFixed(3);
      const label = byPeak.get(key);
      if (!label) byPeak.set(key, { peakNm: l.peakNm, species: [c.species], verdict: c.verdict });
      else if (!label.species.includes(c.species)) {
        label.species.push(c.species);
        if (c.verdict === "present") label.verdict = "present";
      }
    }
  }
  return [...byPeak.values()];
}

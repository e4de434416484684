// Whether a parsed spectrum can have been recorded on an instrument: a pixel axis must lie on its
// detector (a 4,096-pixel file on a 2,048-pixel instrument was once stored and analysed, its calibration
// extrapolated to 1,450 nm), and a wavelength axis should overlap its nominal range (said, not refused:
// a factory axis may reach beyond what the lab states).
import type { AxisUnit } from "../types";
import { toNanometres } from "../units/to-nanometres";

export interface InstrumentFrame {
  /** The instrument's name, for the sentences. */
  name: string;
  /** Detector pixels. */
  pixels: number;
  /** Nominal range [low, high] in nm. */
  nominalRangeNm: [number, number];
}

export interface SpectrumFit {
  /** A sentence saying why the file cannot be this instrument's, or null when it can. */
  refusal: string | null;
  /** Sentences for the chemist to read before storing (the file can be stored). */
  warnings: string[];
}

export interface SpectrumFitOptions {
  /**
   * How the file counts its pixels, when known: a pixel axis must then lie on origin … origin +
   * pixels − 1. Unknown, either counting passes (0 … pixels).
   * @default undefined (unknown)
   */
  pixelOrigin?: 0 | 1;
}

/** Shares of a file's span below which its overlap with the nominal range is worth saying. */
const MIN_OVERLAP_SHARE = 0.5;

const round = (value: number) => Number(value.toPrecision(6));

/** Checks a spectrum's first column against the instrument it is uploaded to. */
export function spectrumFitToInstrument(
  x: Float64Array,
  xUnit: AxisUnit,
  instrument: InstrumentFrame,
  options: SpectrumFitOptions = {},
): SpectrumFit {
  const { pixelOrigin } = options;
  if (pixelOrigin !== undefined && pixelOrigin !== 0 && pixelOrigin !== 1) {
    throw new RangeError(`pixelOrigin must be 0 or 1, got ${String(pixelOrigin)}`);
  }
  if (x.length === 0) return { refusal: null, warnings: [] };
  let low = Infinity;
  let high = -Infinity;
  for (const value of x) {
    if (value < low) low = value;
    if (value > high) high = value;
  }
  if (xUnit === "pixel") {
    // Pixels count from 0 or from 1: unless the counting is known, the last index is pixels − 1 or pixels.
    const first = pixelOrigin ?? 0;
    const last =
      pixelOrigin === undefined ? instrument.pixels : pixelOrigin + instrument.pixels - 1;
    if (low < first || high > last) {
      const indices =
        pixelOrigin === undefined
          ? `0 to ${instrument.pixels - 1}`
          : `${first} to ${last}, counted from ${pixelOrigin}`;
      return {
        refusal:
          `This file's first column runs over pixels ${round(low)} to ${round(high)}, but ${instrument.name} has ` +
          `${instrument.pixels.toLocaleString("en")} pixels (${indices}): it was recorded on another ` +
          `detector or with other binning. Upload it to the instrument it was recorded on.`,
        warnings: [],
      };
    }
    return { refusal: null, warnings: [] };
  }
  let nm: Float64Array;
  try {
    nm = toNanometres(Float64Array.of(low, high), { unit: xUnit });
  } catch {
    // An axis with no wavelength (a wavenumber of 0) says nothing about the range; the parser judges it.
    return { refusal: null, warnings: [] };
  }
  const [fileLow, fileHigh] = [Math.min(nm[0], nm[1]), Math.max(nm[0], nm[1])];
  const [nominalLow, nominalHigh] = instrument.nominalRangeNm;
  const overlap = Math.max(0, Math.min(fileHigh, nominalHigh) - Math.max(fileLow, nominalLow));
  const span = fileHigh - fileLow;
  if (span > 0 && overlap < MIN_OVERLAP_SHARE * span) {
    const share = Math.round((100 * overlap) / span);
    return {
      refusal: null,
      warnings: [
        `This file covers ${round(fileLow)} to ${round(fileHigh)} nm, and only ${share} % of it lies in ${instrument.name}'s ` +
          `nominal range (${nominalLow} to ${nominalHigh} nm): check that it was recorded on this instrument.`,
      ],
    };
  }
  return { refusal: null, warnings: [] };
}

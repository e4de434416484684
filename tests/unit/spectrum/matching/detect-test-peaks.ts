// A deliberately simple peak detector for the matching tests only (the real one lives elsewhere).
import type { CalibratedPeak } from "../../../../lib/spectrum/types";
import { makeRandom } from "../../../../lib/spectrum/statistics";

export interface DetectTestPeaksOptions {
  /** Wavelength of each pixel (the true axis). */
  wavelengthNmAtPixel: Float64Array;
  /** Minimum prominence in noise units. */
  minSnr?: number;
  /** Calibration uncertainty in nm, added in quadrature and drawn as a systematic shift. */
  calibrationSigmaNm?: number;
  /** Systematic calibration error applied to every peak, in nm. */
  calibrationOffsetNm?: number;
  saturationCounts?: number;
  seed?: number;
}

function median(values: number[]): number {
  const sorted = [...values].sort((a, b) => a - b);
  const mid = sorted.length >> 1;
  return sorted.length % 2 ? sorted[mid] : (sorted[mid - 1] + sorted[mid]) / 2;
}

/** Rolling-median baseline, MAD noise of first differences, prominence on a 5-point average. */
export function detectTestPeaks(
  y: Float64Array,
  options: DetectTestPeaksOptions,
): CalibratedPeak[] {
  const {
    wavelengthNmAtPixel: grid,
    minSnr = 6,
    calibrationSigmaNm = 0.03,
    calibrationOffsetNm = 0.02,
    saturationCounts = Infinity,
    seed = 5,
  } = options;
  const n = y.length;
  const halfWindow = 150;
  const residual = new Float64Array(n);
  for (let i = 0; i < n; i++) {
    const from = Math.max(0, i - halfWindow);
    const to = Math.min(n, i + halfWindow + 1);
    residual[i] = y[i] - median(Array.from(y.subarray(from, to)));
  }
  const differences: number[] = [];
  for (let i = 1; i < n; i++) differences.push(y[i] - y[i - 1]);
  const mad = median(differences.map((d) => Math.abs(d - median(differences))));
  const noise = (1.4826 * mad) / Math.SQRT2;

  const smooth = new Float64Array(n);
  for (let i = 0; i < n; i++) {
    let sum = 0;
    let count = 0;
    for (let j = Math.max(0, i - 2); j <= Math.min(n - 1, i + 2); j++) {
      sum += residual[j];
      count++;
    }
    smooth[i] = sum / count;
  }

  const random = makeRandom(seed);
  const peaks: CalibratedPeak[] = [];
  for (let i = 3; i < n - 3; i++) {
    if (!(smooth[i] >= smooth[i - 1] && smooth[i] > smooth[i + 1])) continue;
    let leftMin = smooth[i];
    for (let j = i - 1; j >= Math.max(0, i - 40) && smooth[j] <= smooth[i]; j--)
      leftMin = Math.min(leftMin, smooth[j]);
    let rightMin = smooth[i];
    for (let j = i + 1; j <= Math.min(n - 1, i + 40) && smooth[j] <= smooth[i]; j++)
      rightMin = Math.min(rightMin, smooth[j]);
    const prominence = smooth[i] - Math.max(leftMin, rightMin);
    if (prominence < minSnr * noise) continue;

    const [a, b, c] = [residual[i - 1], residual[i], residual[i + 1]];
    const denominator = a - 2 * b + c;
    const shift =
      denominator < 0 ? Math.max(-0.5, Math.min(0.5, (0.5 * (a - c)) / denominator)) : 0;
    const centrePx = i + shift;
    const height = b - 0.25 * (a - c) * shift;
    let left = i;
    while (left > 0 && residual[left] > height / 2) left--;
    let right = i;
    while (right < n - 1 && residual[right] > height / 2) right++;
    const leftCross = left + (height / 2 - residual[left]) / (residual[left + 1] - residual[left]);
    const rightCross =
      right - (height / 2 - residual[right]) / (residual[right - 1] - residual[right]);
    const fwhmPx = Math.max(1, rightCross - leftCross);
    const snr = height / noise;
    const xUncertainty = Math.max(0.02, (0.5 * fwhmPx) / snr);

    const k = Math.min(n - 2, Math.floor(centrePx));
    const dispersion = grid[k + 1] - grid[k];
    const trueNm = grid[k] + (centrePx - k) * dispersion;
    const wavelengthNm = trueNm + calibrationOffsetNm + 0.5 * calibrationSigmaNm * random.normal();
    peaks.push({
      index: i,
      x: centrePx,
      xUncertainty,
      height,
      fwhm: fwhmPx,
      area: 1.0645 * height * fwhmPx,
      snr,
      saturated: y[i] >= saturationCounts,
      blended: false,
      wavelengthNm,
      wavelengthUncertaintyNm: Math.hypot(xUncertainty * Math.abs(dispersion), calibrationSigmaNm),
      fwhmNm: fwhmPx * Math.abs(dispersion),
    });
  }
  return peaks;
}

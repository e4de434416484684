// Server-side helpers of the workflow pages: a service's not-found becomes the page's not-found, and
// a stored spectrum becomes a chart series (thinned for the browser, on the calibrated axis for runs).
import "server-only";
import { notFound } from "next/navigation";
import type { Actor } from "@/lib/auth/actor";
import { AppError } from "@/lib/errors";
import { evaluateStoredCalibration } from "@/lib/services/calibrations";
import { loadSpectrum, spectrumPoints } from "@/lib/services/spectra";
import type { AxisUnit } from "@/lib/spectrum/types";
import type { SpectrumSeries } from "@/components/charts/spectrum-charts";

export async function orNotFound<T>(promise: Promise<T>): Promise<T> {
  try {
    return await promise;
  } catch (error) {
    if (error instanceof AppError && error.code === "not_found") notFound();
    throw error;
  }
}

/** A record id from the URL; a malformed one is simply not found. */
export function idOrNotFound(value: string | undefined): string {
  if (!value || !/^[0-9a-f]{8}-[0-9a-f]{4}-[0-9a-f]{4}-[0-9a-f]{4}-[0-9a-f]{12}$/i.test(value)) notFound();
  return value;
}

/** Most points a chart is sent; beyond it each bucket keeps its lowest and highest count, so no peak is lost. */
const MAX_CHART_POINTS = 8000;

function thinned(x: Float64Array, y: Float64Array): SpectrumSeries {
  if (x.length <= MAX_CHART_POINTS) return { x: Array.from(x), y: Array.from(y) };
  const bucket = Math.ceil((2 * x.length) / MAX_CHART_POINTS);
  const out: SpectrumSeries = { x: [], y: [] };
  for (let start = 0; start < x.length; start += bucket) {
    let lo = start;
    let hi = start;
    for (let i = start; i < Math.min(x.length, start + bucket); i++) {
      if (y[i] < y[lo]) lo = i;
      if (y[i] > y[hi]) hi = i;
    }
    for (const i of lo < hi ? [lo, hi] : lo === hi ? [lo] : [hi, lo]) {
      out.x.push(x[i]);
      out.y.push(y[i]);
    }
  }
  return out;
}

/** A spectrum's points as they were uploaded (its own x axis). */
export async function rawSeries(actor: Actor, spectrumId: string): Promise<SpectrumSeries> {
  const { x, y } = spectrumPoints(await orNotFound(loadSpectrum(actor, spectrumId)));
  return thinned(x, y);
}

/** A sample on the wavelength axis its run used: the calibration's, or else the file's own axis in nm. */
export async function calibratedSeries(
  actor: Actor,
  spectrumId: string,
  calibrationId: string | null,
  xUnit: AxisUnit,
): Promise<SpectrumSeries> {
  const raw = await rawSeries(actor, spectrumId);
  if (calibrationId) {
    const { wavelengthsNm } = await evaluateStoredCalibration(actor, calibrationId, raw.x);
    const kept = wavelengthsNm.map((nm, i) => [nm, raw.y[i]] as const).filter(([nm]) => nm !== null) as [number, number][];
    return { x: kept.map(([nm]) => nm), y: kept.map(([, y]) => y) };
  }
  // No calibration: the file carries its own axis (the run marks it "not lamp-checked").
  const toNm = xUnit === "angstrom" ? (v: number) => v / 10 : xUnit === "wavenumber" ? (v: number) => 1e7 / v : (v: number) => v;
  return { x: raw.x.map(toNm), y: raw.y };
}

export const X_TITLES: Record<AxisUnit, string> = {
  pixel: "Pixel",
  nm: "Wavelength (nm)",
  angstrom: "Wavelength (Å)",
  wavenumber: "Wavenumber (cm⁻¹)",
};

// Server-side helpers of the workflow pages: a service's not-found becomes the page's not-found, and
// the plain points a service returns become a chart series (thinned by a pure helper for the browser).
import "server-only";
import { notFound } from "next/navigation";
import type { Actor } from "@/lib/auth/actor";
import { AppError } from "@/lib/errors";
import { fetchRunSpectrum, fetchSpectrumPoints } from "@/lib/services/run-spectrum";
import type { AxisUnit } from "@/lib/spectrum/types";
import type { SpectrumSeries } from "@/components/charts/spectrum-charts";
import { thinSeries } from "@/lib/charts/thin-series";
import { isRecordId } from "@/lib/validation/record-id";

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
  if (!isRecordId(value)) notFound();
  return value;
}

/** A spectrum's points as they were uploaded (its own x axis), thinned for the browser. */
export async function rawSeries(actor: Actor, spectrumId: string): Promise<SpectrumSeries> {
  const { x, y } = await orNotFound(fetchSpectrumPoints(actor, spectrumId));
  const thin = thinSeries(x, y);
  return { x: thin.x, y: thin.y, sourcePoints: thin.sourcePoints };
}

/** A run's sample on the axis the run used, with the continuum it removed, thinned for the browser. */
export async function runSeries(
  actor: Actor,
  runId: string,
): Promise<{ spectrum: SpectrumSeries; continuum: number[] | null }> {
  const { wavelengthNm, counts, continuum } = await orNotFound(fetchRunSpectrum(actor, runId));
  const thin = thinSeries(wavelengthNm, counts, continuum ? { continuum } : {});
  return {
    spectrum: { x: thin.x, y: thin.y, sourcePoints: thin.sourcePoints },
    continuum: thin.companions.continuum ?? null,
  };
}

export const X_TITLES: Record<AxisUnit, string> = {
  pixel: "Pixel",
  nm: "Wavelength (nm)",
  angstrom: "Wavelength (Å)",
  wavenumber: "Wavenumber (cm⁻¹)",
};

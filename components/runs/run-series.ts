// A run's sample as a chart series, on the server: the plain points the service returns, thinned by a
// pure helper for the browser.
import "server-only";
import type { Actor } from "@/lib/auth/actor";
import { fetchRunSpectrum } from "@/lib/services/run-spectrum";
import type { SpectrumSeries } from "@/components/charts/spectrum-charts";
import { thinSeries } from "@/lib/charts/thin-series";
import { orNotFound } from "@/lib/http/page-not-found";

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

// An uploaded spectrum as a chart series, on the server: the plain points the service returns, thinned
// by a pure helper for the browser.
import "server-only";
import type { Actor } from "@/lib/auth/actor";
import { fetchSpectrumPoints } from "@/lib/services/run-spectrum";
import type { SpectrumSeries } from "@/components/charts/spectrum-charts";
import { thinSeries } from "@/lib/charts/thin-series";
import { orNotFound } from "@/lib/http/page-not-found";

/** A spectrum's points as they were uploaded (its own x axis), thinned for the browser. */
export async function rawSeries(actor: Actor, spectrumId: string): Promise<SpectrumSeries> {
  const { x, y } = await orNotFound(fetchSpectrumPoints(actor, spectrumId));
  const thin = thinSeries(x, y);
  return { x: thin.x, y: thin.y, sourcePoints: thin.sourcePoints };
}

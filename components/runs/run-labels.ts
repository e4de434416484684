// The run chart's line labels: one per identified peak, species sharing a peak stacked in one label
// so their names do not print over each other. Shared by the run page and the review page.
import type { LineLabel } from "@/components/charts/spectrum-charts";
import type { RunCall } from "@/lib/runs/types";

export function runChartLabels(calls: readonly RunCall[]): LineLabel[] {
  const byPeak = new Map<string, LineLabel>();
  for (const c of calls) {
    if (c.verdict === "absent") continue;
    for (const l of c.lines) {
      const key = l.peakNm.toFixed(3);
      const label = byPeak.get(key);
      if (!label)
        byPeak.set(key, {
          peakNm: l.peakNm,
          species: c.species,
          verdict: c.verdict as LineLabel["verdict"],
        });
      else if (!label.species.split("<br>").includes(c.species)) {
        label.species += `<br>${c.species}`;
        if (c.verdict === "present") label.verdict = "present";
      }
    }
  }
  return [...byPeak.values()];
}

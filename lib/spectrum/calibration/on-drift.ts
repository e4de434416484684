// The candidate pairs a drift keeps: one per line and one per peak, each within its reach.
import type { Candidate } from "./recalibration-types";

/** Each line's candidate nearest the drift `at`, when within its reach; a peak keeps its nearest line. */
export function onDrift(
  candidates: Candidate[],
  at: (u: number) => number,
  reachCap = Infinity,
): Candidate[] {
  const byLine = new Map<number, { candidate: Candidate; miss: number }>();
  for (const c of candidates) {
    const miss = Math.abs(c.pair.x - at(c.u));
    if (miss > Math.min(c.reach, reachCap)) continue;
    const current = byLine.get(c.pair.lineIndex);
    if (!current || miss < current.miss) byLine.set(c.pair.lineIndex, { candidate: c, miss });
  }
  const byPeak = new Map<number, { candidate: Candidate; miss: number }>();
  for (const entry of byLine.values()) {
    const current = byPeak.get(entry.candidate.pair.peakIndex);
    if (!current || entry.miss < current.miss) byPeak.set(entry.candidate.pair.peakIndex, entry);
  }
  return [...byPeak.values()].map((e) => e.candidate).sort((a, b) => a.u - b.u);
}

// Shortens an absent call's lists of evidence; its counts stay exact.

import type { ElementCall } from "./score-elements-types";

/**
 * Keeps an absent call's `limit` strongest seen lines (in their listed order: by peak, then table
 * order) and its `limit` first missing lines (already strongest first).
 */
export function trimAbsentEvidence(call: ElementCall, limit: number): void {
  if (call.seen.length > limit) {
    const strongest = new Set(
      call.seen
        .map((seen, i) => ({ i, relative: seen.relativeIntensity ?? -1 }))
        .sort((a, b) => b.relative - a.relative || a.i - b.i)
        .slice(0, limit)
        .map((entry) => entry.i),
    );
    call.seen = call.seen.filter((_, i) => strongest.has(i));
  }
  call.missing.splice(limit);
}

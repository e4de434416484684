// The species scoring works on, each with its seen groups weighed and the anchor its scale comes from.

import { newSpeciesWork } from "./new-species-work";
import type { LineIndex } from "./prepare-line-index";
import type {
  FlatCandidates,
  ScoreSettings,
  SeenGroup,
  SeenGroups,
  SpeciesWork,
} from "./score-elements-stage-types";

/**
 * Only species with a matched line, or with strong lines in range to report missing, are worked on;
 * each is located in the table by binary search, never by scanning the range. Each group is weighed
 * by its lines' relative intensities and its closest match, and each species anchored on its
 * strongest rated group.
 */
export function setUpSpeciesWork(
  index: LineIndex,
  seen: SeenGroups,
  candidates: FlatCandidates,
  settings: Pick<ScoreSettings, "source" | "strongLineFraction" | "unratedLineWeight"> & {
    rangeNm: [number, number];
    judgedRangeNm: [number, number];
  },
): Map<string, SpeciesWork> {
  const { groupsByPeak } = seen;
  const { unratedLineWeight } = settings;
  const work = new Map<string, SpeciesWork>();
  for (const [id, groups] of seen.groupsOfSpecies) {
    const lines = index.species[id];
    const entry = newSpeciesWork(lines, settings);
    entry.groups = groups;
    work.set(lines.species, entry);
  }
  for (const lines of index.species) {
    if (work.has(lines.species)) continue;
    const entry = newSpeciesWork(lines, settings);
    if (entry.strongInRange > 0) work.set(lines.species, entry);
  }

  const { positionInSpecies } = index;
  for (const entry of work.values()) {
    const { relative: relativeInSpecies } = entry.info.scale;
    for (const group of entry.groups) {
      let rated = 0;
      let unrated = 0;
      let closest = Infinity;
      for (const member of group.members) {
        const relative = relativeInSpecies[positionInSpecies[candidates.lineIndex[member]]];
        if (Number.isNaN(relative)) unrated += unratedLineWeight;
        else rated += relative;
        closest = Math.min(closest, candidates.absSigma[member]);
      }
      group.ratedWeight = Math.min(1, rated);
      group.weight = Math.min(1, rated + unrated);
      // Half-weight at 2.35σ: a softer fall than the Gaussian itself, so 1–2σ matches stay strong.
      group.quality = Math.exp(-0.5 * (closest / 2) ** 2);
    }
    entry.groups.sort((a, b) => a.peakIndex - b.peakIndex);
    // The species' scale comes from its own lines: the strongest peak no other species claims, when
    // there is one. A shared peak may be mostly another species' (a weak line at a strong neighbour's
    // peak would predict every other line of the species far too bright).
    const ownPeak = (group: SeenGroup) => groupsByPeak.get(group.peakIndex)!.size === 1;
    const strongest = (from: SeenGroup[]) =>
      from.reduce<SeenGroup | null>(
        (best, group) => (group.ratedWeight > 0 && (!best || group.snr > best.snr) ? group : best),
        null,
      );
    entry.anchor = strongest(entry.groups.filter(ownPeak)) ?? strongest(entry.groups);
  }
  return work;
}

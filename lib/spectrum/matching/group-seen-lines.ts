// Groups each peak's credited lines by species: one piece of evidence per species and peak.

import type { CalibratedPeak } from "../types";
import type { PeakMatch } from "./match-peaks-to-lines";
import type { LineIndex } from "./prepare-line-index";
import type { LineAssignment, SeenGroup, SeenGroups } from "./score-elements-stage-types";

/**
 * One group per species and peak, holding its lines in table order (the order their intensities are
 * summed in); the groups of a peak are kept in the order of their first line. Every species with a
 * candidate at a peak is named there, credited or not.
 */
export function groupSeenLines(
  matches: readonly PeakMatch[],
  index: LineIndex,
  assignment: LineAssignment,
  snrOf: (peak: CalibratedPeak) => number,
): SeenGroups {
  const { candidates, bestCandidateOfLine } = assignment;
  const groupsOfSpecies = new Map<number, SeenGroup[]>();
  const groupsByPeak = new Map<number, Map<string, SeenGroup>>();
  const speciesAtPeak = new Map<number, string[]>();
  const speciesStamp = new Int32Array(index.species.length).fill(-1);
  const groupOfSpecies: (SeenGroup | undefined)[] = new Array(index.species.length);
  let flat = 0;
  for (let m = 0; m < matches.length; m++) {
    const match = matches[m];
    const names: string[] = [];
    const here: SeenGroup[] = [];
    for (let c = 0; c < match.columns.count; c++, flat++) {
      const lineIndex = candidates.lineIndex[flat];
      const id = index.speciesOfLine[lineIndex];
      if (speciesStamp[id] !== m) {
        speciesStamp[id] = m;
        names.push(index.species[id].species);
        groupOfSpecies[id] = undefined;
      }
      if (bestCandidateOfLine[lineIndex] !== flat) continue;
      let group = groupOfSpecies[id];
      if (!group) {
        group = {
          peakIndex: match.peakIndex,
          peak: match.peak,
          members: [],
          weight: 0,
          ratedWeight: 0,
          quality: 0,
          snr: snrOf(match.peak),
        };
        groupOfSpecies[id] = group;
        here.push(group);
      }
      group.members.push(flat);
    }
    speciesAtPeak.set(match.peakIndex, names.sort());
    if (here.length === 0) continue;
    // The columns hold a table's lines in wavelength order, then its bands: a group is in table
    // order already unless the table was not given in wavelength order or mixes in a band.
    const lineOf = candidates.lineIndex;
    for (const group of here) {
      const { members } = group;
      for (let i = 1; i < members.length; i++) {
        if (lineOf[members[i]] < lineOf[members[i - 1]]) {
          members.sort((x, y) => lineOf[x] - lineOf[y]);
          break;
        }
      }
    }
    here.sort((x, y) => lineOf[x.members[0]] - lineOf[y.members[0]]);
    const atPeak = new Map<string, SeenGroup>();
    for (const group of here) {
      const lineIndex = lineOf[group.members[0]];
      const id = index.speciesOfLine[lineIndex];
      atPeak.set(index.species[id].species, group);
      const ofSpecies = groupsOfSpecies.get(id);
      if (ofSpecies) ofSpecies.push(group);
      else groupsOfSpecies.set(id, [group]);
    }
    groupsByPeak.set(match.peakIndex, atPeak);
  }
  return { groupsByPeak, speciesAtPeak, groupsOfSpecies };
}

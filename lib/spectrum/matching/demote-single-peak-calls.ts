// Calls present on one peak alone stay possible unless that peak is unambiguous proof.

import type { CalibratedPeak } from "../types";
import { closestFirstOrder } from "./candidate-columns";
import { demoteToPossible } from "./demote-to-possible";
import { EXPLAINING_SHARE } from "./explaining-share";
import { positionsWithin } from "./lower-bound";
import type { ElementCall } from "./score-elements-types";
import type { SinglePeakContext, SpeciesWork } from "./score-elements-stage-types";
import { seenBandsCovering } from "./seen-bands-covering";
import { unseenLinesAllow } from "./unseen-lines-allow";
import { walkStrongestFirst } from "./walk-strongest-first";

/** A call resting on one peak needs it this far above the noise, above the peak finder's default
 * threshold of 5: bumps of continuum noise at SNR 5–6 made a band present on the sample sweep
 * (seeds 12 and 97, n 200: false present 0.50 → 0.35 % and 0.55 → 0.35 %; recall with the
 * principal line in range 95.3 → 95.3 % and 93.0 → 92.5 %). */
const SINGLE_PEAK_MIN_SNR = 7;

/**
 * One peak is proof only of the species' principal line, and only when no other species in the table
 * explains it. A species holds a peak when its share of it is EXPLAINING_SHARE or more (heldPeaks); a
 * "present" call that holds none becomes "possible". One that holds a single peak becomes "possible" when the peak holds none of
 * its principal line (the strongest for the source), or when another species (of another element) has
 * a line there that could have made the peak: its unseen lines allow it (unseenLinesAllow) and, when it
 * is seen elsewhere, its line here is not too faint for the peak (couldMake). Two single-peak calls on
 * one peak both become "possible": neither is present on that evidence alone.
 */
export function demoteSinglePeakCalls(calls: ElementCall[], context: SinglePeakContext): void {
  const callOf = new Map(calls.map((call) => [call.species, call]));
  const { index } = context;
  for (const call of calls) {
    const held = context.work.get(call.species)?.heldPeaks ?? [];
    if (call.verdict !== "present" || held.length > 1 || call.seen.length === 0) continue;
    if (held.length === 0) {
      const at = [...new Set(call.seen.map((s) => s.peakWavelengthNm.toFixed(2)))].join(", ");
      demoteToPossible(
        call,
        `Its lines stand only on peaks that other species explain for the most part (${at} nm); ` +
          `a peak of its own would decide.`,
        "No peak of its own.",
      );
      continue;
    }
    const peakIndex = held[0];
    const match = context.matchByPeak.get(peakIndex)!;
    const peakNm = match.peak.wavelengthNm.toFixed(2);
    const snr = match.peak.snr;
    const alone = call.seenPeaks === 1;
    const onlyPeak = alone
      ? `Only one peak is seen (${peakNm} nm)`
      : `Only one peak is its own (${peakNm} nm; the others are mostly other species')`;
    if (snr < SINGLE_PEAK_MIN_SNR) {
      demoteToPossible(
        call,
        `${onlyPeak}, at SNR ${snr.toFixed(1)}: too faint alone to call ` +
          `${call.species} present; another of its lines would decide.`,
        "One faint peak is no proof.",
      );
      continue;
    }
    if (!call.seen.some((s) => s.peakIndex === peakIndex && s.relativeIntensity === 1)) {
      demoteToPossible(
        call,
        `${onlyPeak} and it holds none of the principal line of ${call.species}; ` +
          `its strongest line would decide.`,
        "One peak without the principal line is no proof.",
      );
      continue;
    }
    // The rival's line at the peak most able to make it: its strongest there. Any line within half the
    // instrument's width of the peak can be part of it, matched or not; a species the table rates only
    // for other sources is weighed on their scale (the table holds it, and a lamp or a sample can show it).
    const rivalLine = new Map<string, { lineIndex: number; relative: number }>();
    const halfWidthNm = 0.5 * (match.peak.resolutionNm ?? match.peak.fwhmNm);
    const within: number[] = [];
    const [first, end] = positionsWithin(
      index.lineWavelengthNm,
      match.peak.wavelengthNm - halfWidthNm,
      match.peak.wavelengthNm + halfWidthNm,
    );
    for (let i = first; i < end; i++) within.push(index.lineOrder[i]);
    const { columns } = match;
    const closest = Array.from(closestFirstOrder(columns), (i) => columns.lineIndex[i]);
    for (const lineIndex of [...closest, ...within]) {
      const lines = index.species[index.speciesOfLine[lineIndex]];
      const rival = context.work.get(lines.species);
      if (lines.element === call.element || !rival) continue;
      const relative = rival.info.scale.relative[index.positionInSpecies[lineIndex]];
      const held = rivalLine.get(lines.species);
      if (held === undefined || relative > held.relative) {
        rivalLine.set(lines.species, { lineIndex, relative });
      }
    }
    const explainers: string[] = [];
    for (const [species, { lineIndex, relative }] of rivalLine) {
      // A rival explains the peak when it could make a fair share of it (EXPLAINING_SHARE) without its
      // other lines showing. One seen elsewhere must also not be too faint there for the peak, and
      // when its own lines call it absent at that scale, the share must still be allowed.
      const rivalCall = callOf.get(species);
      const allowedByUnseen = () =>
        unseenLinesAllow(context.work.get(species)!, lineIndex, EXPLAINING_SHARE * snr, context);
      const fromElsewhere = rivalCall ? couldMake(rivalCall, peakIndex, relative, snr) : null;
      const could =
        fromElsewhere === null
          ? allowedByUnseen()
          : fromElsewhere && (rivalCall!.verdict !== "absent" || allowedByUnseen());
      if (could) explainers.push(species);
    }
    // A line inside the extent of a band called present needs its own confirming lines: the band's
    // fading tail lies under it whatever the band's head zone says.
    for (const species of seenBandsCovering(match.peak, call.element, callOf, index)) {
      if (!explainers.includes(species)) explainers.push(species);
    }
    if (explainers.length === 0) continue;
    explainers.sort();
    const names = explainers.join(", ");
    // The line that would decide: the strongest of each species in range away from this peak.
    const deciders = [call.species, ...explainers].flatMap((species) => {
      const nm = decidingLineNm(context.work.get(species), match.peak);
      return nm === null ? [] : [`${species} ${nm.toFixed(2)} nm`];
    });
    demoteToPossible(
      call,
      `Interference: ${names} also explain${explainers.length === 1 ? "s" : ""} the only peak ${alone ? "seen" : "of its own"}, at ` +
        `${peakNm} nm; ` +
        (deciders.length > 0
          ? `a peak at ${deciders.join(" or ")} would decide.`
          : `another line of ${call.species} would decide.`),
      `Only one peak is ${alone ? "seen" : "its own"}, and ${names} ${explainers.length === 1 ? "has" : "have"} a line there too.`,
    );
  }
}

/**
 * Whether `rival`'s line at `peakIndex` could have made that peak: judged from the rival's strongest
 * line seen at another peak, scaled by the two lines' relative intensities (a faint line of a species
 * seen strongly elsewhere cannot make a strong peak). A line the table gives no intensity is taken as
 * no stronger than the rival's faintest rated line seen (the table rates a species' strong lines).
 * Null without a rated line seen elsewhere: nothing there to judge from.
 */
function couldMake(
  rival: ElementCall,
  peakIndex: number,
  relativeHere: number,
  peakSnr: number,
): boolean | null {
  const elsewhere = rival.seen.filter(
    (s) => s.peakIndex !== peakIndex && s.relativeIntensity !== null && s.relativeIntensity > 0,
  );
  if (elsewhere.length === 0) return null;
  if (!(peakSnr > 0)) return true;
  const anchor = elsewhere.reduce((a, b) => (b.relativeIntensity! > a.relativeIntensity! ? b : a));
  const relative = Number.isNaN(relativeHere)
    ? Math.min(...elsewhere.map((s) => s.relativeIntensity!))
    : relativeHere;
  const expectedSnr = (anchor.snr * relative) / anchor.relativeIntensity!;
  return expectedSnr >= EXPLAINING_SHARE * peakSnr;
}

/**
 * The species' strongest line in range (by relative intensity for the source) farther than the
 * peak's FWHM from it: where a peak would tell this species from its rivals. Null when none.
 */
function decidingLineNm(entry: SpeciesWork | undefined, peak: CalibratedPeak): number | null {
  if (!entry) return null;
  const { maxTree } = entry.info.scale;
  const { nm } = entry.info.lines;
  let found: number | null = null;
  for (const [from, to] of [entry.info.atomicInRange, entry.info.bandsInRange]) {
    walkStrongestFirst(maxTree, from, to, 0, (p) => {
      if (Math.abs(nm[p] - peak.wavelengthNm) <= peak.fwhmNm) return true;
      found = nm[p];
      return false;
    });
    if (found !== null) break;
  }
  return found;
}

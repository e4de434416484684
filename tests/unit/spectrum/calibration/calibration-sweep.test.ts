// A fixed-seed sweep of 300 realistic instruments (tests/support/realistic-lamp.ts) through automatic
// lamp calibration, against the generator's truth. The same figures, for any seed and size, come
// from `npm run sweep -- --seed N --n M` (add --previous for recalibration from the last calibration).
//
// The targets: success ≥ 95 % where ≥ 6 table lamp lines are in range; silent wrong (reported
// "paired" but outside tolerance) ≤ 0.5 % of all; 0 exceptions; ≥ 99 % with the previous calibration.
// Not all are reached yet: the floors below are what this code measured on these seeds (a regression
// floor, not the goal); raise them as the pairing improves.
import { beforeAll, describe, expect, it } from "vitest";
import {
  formatSweep,
  runSweep,
  summarise,
  type SweepRecord,
  type SweepSummary,
} from "../../../support/calibration-sweep";

// Cheaper than the CLI's mix (2048-pixel arrays only) so the unit suite stays quick.
const SEED = 1000;
const COUNT = 300;
/**
 * Measured on these seeds when the floors were last set (a trusted pairing's claim steps one pair in
 * from each end, claim-from-second-pairs.ts): silent wrong 0 of 300 (the floor is the target, ≤ 0.5 %),
 * success 68.7 % of the 281 eligible instruments (target ≥ 95 %), 0 exceptions; over 4,800
 * instruments of seventeen sweeps, 3,188 right and 30 silently wrong "paired" calibrations became
 * 3,202 and 16. Before: silent wrong 0.67 % (2 of 300) and 68.0 %; 67.3 % when the blind search's
 * short-baseline hypotheses began to weigh each landing by its closeness, over 1,500 blind instruments of five
 * seeds successes 959 → 975 with 11 silent wrongs before and after, and on 1,100 fresh ones (seeds
 * 14400000–14700000) 673 → 691 with 15 → 14. Before: 0.67 % and 66.9 % (a grating paired at twelve
 * lines or more may scatter by a quarter of a tolerance; on the same 1,500, 952 → 959 successes with
 * 11 silent wrongs before and after). Before: 0.67 % and 65.8 %
 * (the covered range ends at the outermost pairs whose centres are sound, and a sound centre allows a
 * pull of a tenth of its width; on the same 1,500, successes 924 → 952 and silent wrongs 16 → 11).
 * Before: 0.67 % and 64.8 % (a grating whose growth trusts nothing gets the
 * whole-array draws as a second opinion; on the same 1,500, 912 → 924 successes with 16 silent
 * wrongs before and after). Before: 0.67 % and 64.1 % (pairs beyond a gap that the rest foretold, each on the one clean peak its line
 * could take, no longer flagged for their gap; three beyond a gap looked for from seven pairs on; on
 * the same 1,500 instruments 895 → 912 successes, 16 silent wrongs before and after). Before: 0.67 % and 62.6 % (a
 * physical prism held against a smooth curve instead of Hartmann's formula, and the lack-of-fit
 * check; on 900 prisms of seeds 12100000–12300000 successes 443 → 503 with 11 silent wrongs before
 * and after). Before: 1.0 % and 61.6 % (a prism's growth trusted on its own, when the draws found nothing, from
 * nine pairs; on 2,200 instruments of eight seeds 27 more successes and no more silent wrongs). Before: 60.9 % here (a prism's whole-array draws
 * weigh every centre with the 3 % FWHM floor, `withCentreFloor`). This seed is the
 * one that lost: over 2,200 blind instruments of eight seeds (this one, 2000 at 2048 pixels,
 * 9500000, 9600000, 9800000, 9900000, 10600000 of the CLI's mix and prisms, 10700000 prisms) the
 * floor took successes up by 45 with the same 11 silent wrongs; here 174 → 171 and 1 → 3 (an SF10
 * prism that the draws and growth paired alike with two wrong middle pairs, and an N-SF11 prism
 * whose two model shapes now agree to within the check's limit). Before: silent wrong 0.33 % (1 of
 * 300), success 61.9 % (pairs beyond a gap set aside for up to three rounds, each against the
 * shorter span left); on 1500
 * instruments 822 → 843 successes with the same 10 silent wrongs. Before: 59.8 % here (a prism's
 * draws that trust nothing get growth as a second opinion, trusted where the draws' candidate
 * covers and agrees with it); on 1500 instruments (this seed and 9500000–9900000 of the CLI's mix)
 * successes went from 796 to 822 (prisms 150 → 176), silent wrong 10 both. Before: 58.0 % here (a
 * peak's centre uncertainty grows with its extra width over its clean neighbours', beyond its
 * width's noise, and a peak split from a neighbour gets a quarter of the clean width), as before
 * that on this seed; five fresh seeds of the CLI's mix (9500000–9900000, 1200 instruments) went
 * from 634 to 633 successes and 13 to 9 silent wrongs. Before that: the same figures here (a lamp
 * line cut by the array's end weighed with a FWHM of uncertainty, six pairs enough when every other
 * check passes). Earlier, six fresh seeds of the CLI's mix (1000, 7900000–8300000, n 300 each): 962
 * → 985 successes of 1680 eligible, silent wrong 28 → 27 of 1800. Before: 56.9 % and 0.33 % (raw
 * counts kept around clipped tops, a leap's landed lines judged by a refit). That lost 0.8 points
 * (outcomes churned both ways when saturated lines stopped splitting) while three fresh seeds
 * (3100000–3300000, n 200 each) gained: 288 → 302 successes of 549 eligible, silent wrong 7 → 6 of
 * 600. Before: 57.7 % and 0.7 % (a prism's first guess in the axis of a prism of each catalogue
 * glass); 52.7 % and 0.3 % (pairs beyond a wide gap set aside, trimmed pairings checked again);
 * before that 45.9 % and 0.7 % (hot pixels removed, pulled end pairs set aside), 38.4 % and 1.3 %;
 * before growth from short-baseline anchors, 18.5 % and 2.0 %. On 1200 fresh instruments (seeds
 * 1100000–1600000) the first guess took success from 51.3 to 54.2 % with silent wrong 0.50 → 0.42
 * %.
 */
const SILENT_WRONG_FLOOR = 0.005;
const SUCCESS_FLOOR = 0.68;
/**
 * Recalibration from the previous calibration, 100 instruments: success 90.3 % of 93 eligible and no
 * silent wrong, measured when a day's drift stopped being held back by rivals that take a realignment
 * (the same here before and after; over the 600 re-recorded instruments of seeds 15400000, 16300000
 * and 17700000, 530 → 532 successes, no silent wrong before or after). Earlier: 78.5 % of 93 eligible and no
 * silent wrong with centres weighed as the blind fit weighs them and a prism's second opinion (the
 * fallback when the previous calibration does not serve). Before: 76.3 % of 93 eligible (75.3 %
 * before clipped tops stopped splitting and leaps were judged by a refit; 72.0 % before pairs beyond
 * a gap were set aside; target ≥ 99 %), silent wrong 1 of 100 (an error 1.02 times the tolerance at
 * the end of its covered range), since the covered range is where the lines fix the drift to 0.07
 * tolerance (recalibrate-from-previous.ts). Before: 52.7 % and 0 of 100 (all of the array claimed, or
 * nothing); before the drift, 36.6 % and 2. On three fresh seeds (123456, 223456, 323456; n 200 each,
 * both array lengths): 81.0, 85.7 and 83.2 %, no silent wrong in 600.
 */
const PREVIOUS_COUNT = 100;
const PREVIOUS_SUCCESS_FLOOR = 0.88;
const PREVIOUS_SILENT_WRONG_FLOOR = 0.005;

/** The sweep's headline figures, for the floors here and for whoever raises them. */
function printHead(records: SweepRecord[], title: string): void {
  console.log(formatSweep(records, title).split("\n").slice(0, 4).join("\n"));
}

describe("automatic calibration over 300 realistic instruments", () => {
  let records: SweepRecord[] = [];
  let summary: SweepSummary;
  beforeAll(() => {
    records = runSweep({ seed: SEED, n: COUNT, lamp: { pixels: 2048 } });
    summary = summarise(records);
    printHead(records, `unit sweep: seed ${SEED}, n ${COUNT}, 2048-pixel arrays`);
  }, 900_000);

  it("never throws", () => {
    expect(records).toHaveLength(COUNT);
    expect(summary.exceptions).toBe(0);
  });

  it("is rarely silently wrong", () => {
    // Target ≤ 0.5 %; a regression floor at what was measured (see SILENT_WRONG_FLOOR).
    expect(summary.silentWrongRate).toBeLessThanOrEqual(SILENT_WRONG_FLOOR);
  });

  it("succeeds at least as often as it did when this floor was set", () => {
    // Target ≥ 95 % of eligible instruments; a regression floor at what was measured (see SUCCESS_FLOOR).
    expect(summary.successRateEligible).toBeGreaterThanOrEqual(SUCCESS_FLOOR);
  });
});

describe("recalibration from the previous calibration over 100 realistic instruments", () => {
  let records: SweepRecord[] = [];
  let summary: SweepSummary;
  beforeAll(() => {
    records = runSweep({
      seed: SEED,
      n: PREVIOUS_COUNT,
      withPrevious: true,
      lamp: { pixels: 2048 },
    });
    summary = summarise(records);
    printHead(records, `unit sweep, previous calibration: seed ${SEED}, n ${PREVIOUS_COUNT}`);
  }, 900_000);

  it("never throws", () => {
    expect(records).toHaveLength(PREVIOUS_COUNT);
    expect(summary.exceptions).toBe(0);
  });

  it("is rarely silently wrong", () => {
    // Target ≤ 0.5 %; a regression floor at what was measured (see PREVIOUS_SILENT_WRONG_FLOOR).
    expect(summary.silentWrongRate).toBeLessThanOrEqual(PREVIOUS_SILENT_WRONG_FLOOR);
  });

  it("succeeds at least as often as it did when this floor was set", () => {
    // Target ≥ 99 % (the daily case); a regression floor at what was measured.
    expect(summary.successRateEligible).toBeGreaterThanOrEqual(PREVIOUS_SUCCESS_FLOOR);
  });
});

/** Instruments realigned between the two recordings (a shift of 1.2–3 % of the array, a stretch of up to ±1 %). */
const REALIGNED_COUNT = 60;

describe("recalibration after a realignment over 60 realistic instruments", () => {
  let records: SweepRecord[] = [];
  beforeAll(() => {
    records = runSweep({
      seed: SEED,
      n: REALIGNED_COUNT,
      withPrevious: true,
      change: "realignment",
      lamp: { pixels: 2048 },
    });
    printHead(records, `unit sweep, realigned since the previous calibration: seed ${SEED}`);
  }, 900_000);

  it("never throws", () => {
    expect(records).toHaveLength(REALIGNED_COUNT);
    expect(records.filter((r) => r.outcome === "exception")).toEqual([]);
  });

  it("never trusts a drift of the previous calibration that is not today's axis", () => {
    // A day's drift is preferred to a realignment's (rival-drift.ts): this holds it to the case where
    // the instrument was realigned after all. A drift beyond a day's is checked by a blind search.
    const recalibrated = records.filter((r) => r.message.startsWith("recalibrated"));
    expect(recalibrated.filter((r) => r.outcome === "silent-wrong")).toEqual([]);
    expect(records.filter((r) => r.outcome === "silent-wrong").length).toBeLessThanOrEqual(
      Math.floor(SILENT_WRONG_FLOOR * REALIGNED_COUNT),
    );
  });
});

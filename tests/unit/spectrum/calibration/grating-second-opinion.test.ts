// A grating whose growth from short-baseline anchors trusts nothing gets the whole-array draws as a
// second opinion, by the rule a prism's draws get growth: trusted where growth's own untrusted candidate
// covers and agrees with it, or where growth found nothing and the draws stand on at least nine pairs;
// else offered to check, saying so. Instruments from the realistic-lamp generator
// (tests/support/realistic-lamp.ts), judged against its true axis.
import { describe, expect, it } from "vitest";
import type { CalibrateLampOptions } from "@/lib/spectrum/analysis/calibrate-lamp";
import { calibrateRealisticLamp, probeErrorRatio } from "../../../support/calibration-sweep";
import { realisticLamp, type RealisticLamp } from "../../../support/realistic-lamp";

function calibrate(lamp: RealisticLamp, extra: Partial<CalibrateLampOptions> = {}) {
  expect(lamp.dispersion).not.toBe("prism");
  return calibrateRealisticLamp(lamp, extra);
}

describe("a grating's second opinion", () => {
  it("trusts the draws where growth's untrusted candidate agrees with them", () => {
    // Seed found on the blind sweep (an Ar lamp on a straight grating): growth's candidate failed a
    // check, the draws found the same axis and trusted it.
    const lamp = realisticLamp(12_400_060);
    const growthOnly = calibrate(lamp, { search: "grow" });
    expect(growthOnly.pairing.status).toBe("check");
    expect(growthOnly.pairing.candidate).toBeTruthy();

    const result = calibrate(lamp);
    expect(result.pairing.status).toBe("paired");
    expect(probeErrorRatio(lamp, result.fit!.model).ratio).toBeLessThanOrEqual(1);
  });

  it("trusts the draws standing alone on nine pairs or more when growth found nothing", () => {
    // Seed found on the blind sweep (an Ar lamp, fourteen pairs): growth needs manual pairing.
    // (Instruments 1131 and 12400147, the cases before, are now grown by themselves: 12400147 to a
    // candidate since growth's pairs may set aside one that misses the others' curve.)
    const lamp = realisticLamp(15_000_182);
    const growthOnly = calibrate(lamp, { search: "grow" });
    expect(growthOnly.pairing.status).toBe("needs-manual");
    expect(growthOnly.pairing.candidate ?? null).toBeNull();

    const result = calibrate(lamp);
    expect(result.pairing.status).toBe("paired");
    expect(result.pairing.pairs.length).toBeGreaterThanOrEqual(9);
    expect(probeErrorRatio(lamp, result.fit!.model).ratio).toBeLessThanOrEqual(1);
  });

  it("offers the draws' pairing of fewer than nine pairs to check, saying why", () => {
    // Seed found on the blind sweep (an Hg+Ar lamp, eight pairs): growth needs manual pairing.
    const lamp = realisticLamp(12_400_210);
    expect(calibrate(lamp, { search: "grow" }).pairing.status).toBe("needs-manual");

    const result = calibrate(lamp);
    expect(result.pairing.status).toBe("check");
    expect(result.pairing.reasons?.join(" ")).toMatch(/only the whole-array draws found/);
    expect(result.pairing.pairs).toEqual([]);
    expect(result.fit).toBeNull();
    expect(result.pairing.suggestion.length).toBeLessThan(9);
    // The candidate a person is asked to confirm is the right axis here.
    expect(probeErrorRatio(lamp, result.pairing.candidate!.model).ratio).toBeLessThanOrEqual(1);
  });

  it("leaves an explicitly chosen search alone", () => {
    const lamp = realisticLamp(12_400_210);
    const growthOnly = calibrate(lamp, { search: "grow" });
    expect(growthOnly.pairing.reasons?.join(" ") ?? "").not.toMatch(/whole-array draws/);
  });
});

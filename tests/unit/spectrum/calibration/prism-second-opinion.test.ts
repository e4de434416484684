// A prism whose whole-array draws trust nothing gets growth from short-baseline anchors as a second
// opinion: trusted where the draws' own candidate covers and agrees with it, or where the draws found
// nothing and growth stands on at least nine pairs; else offered to check. Instruments from the realistic-lamp generator (tests/support/realistic-lamp.ts),
// judged against its true axis.
import { describe, expect, it } from "vitest";
import type { CalibrateLampOptions } from "@/lib/spectrum/analysis/calibrate-lamp";
import { calibrateRealisticLamp, probeErrorRatio } from "../../../support/calibration-sweep";
import { realisticLamp, type RealisticLamp } from "../../../support/realistic-lamp";

function calibrate(lamp: RealisticLamp, extra: Partial<CalibrateLampOptions> = {}) {
  expect(lamp.dispersion).toBe("prism");
  return calibrateRealisticLamp(lamp, extra);
}

describe("a prism's second opinion", () => {
  it("trusts growth where the draws' untrusted candidate agrees with it", () => {
    // Seed found on the blind sweep: the draws' candidate failed a check, growth found the same axis.
    const lamp = realisticLamp(9600069);
    const drawsOnly = calibrate(lamp, { search: "ransac" });
    expect(drawsOnly.pairing.status).not.toBe("paired");
    expect(drawsOnly.pairing.candidate).toBeTruthy();

    const result = calibrate(lamp);
    expect(result.pairing.status).toBe("paired");
    expect(probeErrorRatio(lamp, result.fit!.model).ratio).toBeLessThanOrEqual(1);
  });

  it("offers growth's pairing to check, with the reason, when the draws found nothing", () => {
    // Seed found on the blind sweep (an N-SF6 prism of eight pairs). The seeds once here, 9500069 and
    // 12400197, are now trusted: their end pairs beyond a gap were foretold by the rest
    // (predicted-by-the-rest.ts), and they are right.
    const lamp = realisticLamp(12400291);
    const result = calibrate(lamp);
    expect(result.pairing.status).toBe("check");
    expect(result.pairing.reasons?.join(" ")).toMatch(/only the search that grows pairs outward/);
    expect(result.pairing.pairs).toEqual([]);
    expect(result.fit).toBeNull();
    // The candidate a person is asked to confirm is the right axis here.
    const candidate = result.pairing.candidate!;
    expect(result.pairing.suggestion.length).toBeGreaterThanOrEqual(6);
    expect(probeErrorRatio(lamp, candidate.model).ratio).toBeLessThanOrEqual(1);
  });

  it("trusts growth standing alone on nine pairs or more when the draws found nothing", () => {
    // Seed found on the prism sweep (an N-SF11 prism): the draws have no candidate at all.
    const lamp = realisticLamp(9600010, { dispersion: "prism" });
    const drawsOnly = calibrate(lamp, { search: "ransac" });
    expect(drawsOnly.pairing.status).not.toBe("paired");
    expect(drawsOnly.pairing.candidate ?? null).toBeNull();

    const result = calibrate(lamp);
    expect(result.pairing.status).toBe("paired");
    expect(result.pairing.pairs.length).toBeGreaterThanOrEqual(9);
    expect(probeErrorRatio(lamp, result.fit!.model).ratio).toBeLessThanOrEqual(1);
  });

  it("keeps a lone growth pairing of fewer than nine pairs to check", () => {
    const lamp = realisticLamp(12400291);
    const result = calibrate(lamp);
    expect(result.pairing.status).toBe("check");
    expect(result.pairing.suggestion.length).toBeLessThan(9);
  });

  it("leaves an explicitly chosen search alone", () => {
    const lamp = realisticLamp(9500069);
    const drawsOnly = calibrate(lamp, { search: "ransac" });
    expect(drawsOnly.pairing.reasons?.join(" ") ?? "").not.toMatch(/grows pairs outward/);
  });
});

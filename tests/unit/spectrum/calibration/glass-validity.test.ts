// Prism glasses are used only where their Sellmeier formula holds: a range starting below a glass's
// ultraviolet resonance never evaluates it, a named glass outside its range is refused in words, and
// the added catalogue glasses reproduce their makers' published indices.
import { describe, expect, it } from "vitest";
import { fitCalibration, refractiveIndex, CalibrationError } from "@/lib/spectrum/calibration";
import { glassesValidOver } from "@/lib/spectrum/calibration/glasses-valid-over";
import { hypothesisShapes } from "@/lib/spectrum/calibration/lamp-pairing-setup";
import { calibrateLamp } from "@/lib/spectrum/analysis/calibrate-lamp";
import { realisticLamp } from "../../../support/realistic-lamp";
import { probeErrorRatio } from "../../../support/calibration-sweep";

describe("glass validity", () => {
  it("keeps N-SF11 (UV resonance near 249.6 nm) out of a range starting at 230 nm", () => {
    const valid = glassesValidOver([230, 700]);
    expect(valid).not.toContain("N-SF11");
    expect(valid).toContain("fused-silica");
    expect(valid).toContain("CaF2");
    // The first guess of a prism from 230 nm evaluates only valid glasses, so building it does not throw.
    expect(() => hypothesisShapes("prism", [230, 700]).map((g) => g(240))).not.toThrow();
    // Below every catalogue glass the first guess still has a shape.
    expect(hypothesisShapes("prism", [100, 200]).length).toBe(1);
  });

  it("refuses a named glass outside its range with a clear message", () => {
    const pairs = [250, 300, 350, 400, 450, 500, 550].map((wavelengthNm, i) => ({
      x: 100 + 250 * i,
      wavelengthNm,
    }));
    let caught: unknown;
    try {
      fitCalibration(pairs, { model: "prism", glass: "N-SF11" });
    } catch (error) {
      caught = error;
    }
    expect(caught).toBeInstanceOf(CalibrationError);
    expect((caught as CalibrationError).code).toBe("glass-out-of-range");
    expect((caught as CalibrationError).message).toMatch(/N-SF11 is described only between/);
  });

  it("reproduces the published n_d of the added glasses", () => {
    // SCHOTT SF10 data sheet: n_d = 1.72825 (from memory)
    expect(Math.abs(refractiveIndex("SF10", 587.5618) - 1.72825)).toBeLessThan(2e-5);
    // SCHOTT N-BAK4 data sheet: n_d = 1.56883 (from memory)
    expect(Math.abs(refractiveIndex("N-BAK4", 587.5618) - 1.56883)).toBeLessThan(2e-5);
    // Malitson 1963 CaF2: n = 1.43385 at 587.6 nm (from memory)
    expect(Math.abs(refractiveIndex("CaF2", 587.5618) - 1.43385)).toBeLessThan(3e-5);
  });
});

/** A clean 2048-pixel prism lamp of the realistic generator, calibrated automatically. */
function calibratedPrism(seed: number, glass: string, rangeNm: [number, number], gases: string[]) {
  const lamp = realisticLamp(seed, {
    dispersion: "prism",
    glass,
    rangeNm,
    gases,
    clean: true,
    pixels: 2048,
  });
  const result = calibrateLamp(lamp.x, lamp.y, lamp.lines, {
    nominalRangeNm: lamp.statedRangeNm,
    dispersion: "prism",
    resolutionNm: lamp.resolutionNm,
  });
  return { lamp, result };
}

describe("prisms outside the usual range and glass", () => {
  it("calibrates a fused-silica prism whose range starts at 230 nm (Hg + Ar lamp)", () => {
    const { lamp, result } = calibratedPrism(3, "fused-silica", [230, 600], ["Hg", "Ar"]);
    expect(result.pairing.status).toBe("paired");
    const model = result.fit!.model;
    expect(model.kind === "prism" && model.glass).toBe("fused-silica");
    expect(model.kind === "prism" && model.glassFitted).toBeFalsy();
    expect(probeErrorRatio(lamp, model).ratio).toBeLessThanOrEqual(1);
  }, 60_000);

  it("calibrates a prism of a glass not in the catalogue (N-LASF9)", () => {
    const { lamp, result } = calibratedPrism(2, "N-LASF9", [400, 850], ["Ne", "Ar"]);
    // Its 36 pairs are within their σ of the nearest catalogue glass (N-SF11) here, so that glass is
    // kept; a glass the catalogue misses beyond the pairs' σ gets its terms fitted (fitted-glass.test.ts).
    expect(result.pairing.status).toBe("paired");
    const model = result.fit!.model;
    expect(model.kind === "prism" && model.glass).toBe("N-SF11");
    expect(model.kind === "prism" && model.glassFitted).toBeFalsy();
    expect(probeErrorRatio(lamp, model).ratio).toBeLessThanOrEqual(1);
  }, 60_000);
});

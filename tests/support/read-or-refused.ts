// What the readers' fuzz tests ask of every input: a sound spectrum, or a SpectrumParseError with a
// message — never any other error.
import { expect } from "vitest";
import { SpectrumParseError } from "@/lib/spectrum/io";
import type { Spectrum } from "@/lib/spectrum/types";

/** Why a read spectrum is unsound ("" when sound): lengths, point count, finite values, x increasing. */
export function arraysUnsoundness(
  spectrum: Spectrum,
  minPoints: number,
  maxPoints: number,
): string {
  const { x, y } = spectrum;
  if (x.length !== y.length) return `${x.length} x but ${y.length} y`;
  if (x.length < minPoints || x.length > maxPoints) return `${x.length} points`;
  for (let i = 0; i < x.length; i++) {
    if (!Number.isFinite(x[i]) || !Number.isFinite(y[i])) return `point ${i} not finite`;
    if (i > 0 && !(x[i] > x[i - 1])) return `x not increasing at ${i}`;
  }
  return "";
}

/** Runs `read`; a SpectrumParseError with a message is "refused", a spectrum `unsoundness` finds sound is "read"; anything else fails. */
export function readOrRefused(
  read: () => Spectrum,
  unsoundness: (spectrum: Spectrum) => string,
): "read" | "refused" {
  let spectrum: Spectrum;
  try {
    spectrum = read();
  } catch (error) {
    if (!(error instanceof SpectrumParseError)) throw error;
    expect(error.message.length).toBeGreaterThan(0);
    return "refused";
  }
  expect(unsoundness(spectrum)).toBe("");
  return "read";
}

// Hg, Ne and Ar lamp lines in 350–900 nm for the synthetic calibration tests.
// Source: NIST Atomic Spectra Database (ASD), lines of Hg I, Ne I and Ar I, air wavelengths in nm, with
// rounded relative intensities — all typed from memory (from memory), so the tests use them only as
// realistic positions to generate peaks from; the truth of each test is its own generating model.
import type { LampLine } from "@/lib/spectrum/calibration";

const HG: [number, number][] = [
  [365.015, 2800],
  [366.328, 500],
  [404.656, 1800],
  [407.783, 150],
  [434.75, 400],
  [435.833, 4000],
  [491.607, 80],
  [546.074, 1100],
  [576.96, 240],
  [579.066, 280],
  [623.437, 30],
  [690.746, 25],
];
const NE: [number, number][] = [
  [352.047, 200],
  [359.353, 100],
  [540.056, 200],
  [585.249, 2000],
  [588.19, 500],
  [594.483, 500],
  [597.553, 200],
  [602.9997, 100],
  [607.434, 1000],
  [609.616, 300],
  [612.845, 100],
  [614.306, 1000],
  [616.359, 500],
  [621.728, 200],
  [626.65, 1000],
  [630.479, 100],
  [633.443, 1000],
  [638.299, 1000],
  [640.225, 2000],
  [650.653, 1500],
  [653.288, 1000],
  [659.895, 1000],
  [667.828, 500],
  [671.704, 700],
  [692.947, 1000],
  [703.241, 850],
  [717.394, 800],
  [724.517, 1000],
  [743.89, 700],
  [747.244, 40],
  [748.887, 300],
  [753.577, 300],
  [754.404, 130],
  [837.761, 800],
  [849.536, 700],
  [859.126, 400],
  [863.465, 350],
  [865.438, 600],
  [878.062, 600],
  [885.387, 300],
];
const AR: [number, number][] = [
  [415.859, 400],
  [419.832, 200],
  [420.068, 400],
  [425.936, 200],
  [426.629, 180],
  [427.217, 150],
  [430.01, 100],
  [433.356, 80],
  [434.517, 50],
  [696.543, 10000],
  [706.722, 10000],
  [714.704, 1000],
  [727.294, 2000],
  [738.398, 10000],
  [750.387, 20000],
  [751.465, 15000],
  [763.511, 25000],
  [772.376, 15000],
  [794.818, 20000],
  [800.616, 20000],
  [801.479, 25000],
  [810.369, 20000],
  [811.531, 35000],
  [826.452, 10000],
  [840.821, 15000],
  [842.465, 20000],
  [852.144, 15000],
  [866.794, 3000],
];

function build(species: string, rows: [number, number][], scale: number): LampLine[] {
  return rows.map(([wavelengthNm, intensity]) => ({
    wavelengthNm,
    intensity: intensity * scale,
    species,
    id: `${species.replace(" ", "")}-${wavelengthNm.toFixed(3)}`,
  }));
}

/** Lines of a Hg–Ne–Ar lamp; the scale factors put the three gases on one rough intensity scale. */
export const HG_NE_AR_LINES: LampLine[] = [
  ...build("Hg I", HG, 1),
  ...build("Ne I", NE, 1),
  ...build("Ar I", AR, 0.1),
].sort((a, b) => a.wavelengthNm - b.wavelengthNm);

/** Only the neon lines: a set with nothing in the blue below 540 nm except two near-UV lines dropped here. */
export const NEON_LINES: LampLine[] = build(
  "Ne I",
  NE.filter(([w]) => w > 530),
  1,
);

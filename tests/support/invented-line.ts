// A table line for tests that build their own small tables: the species' element and ion stage read
// from its name, a vacuum wavelength by the mean refractive index of air (good to ~0.01 nm in the
// visible; enough for tables matched in air), and the given intensities.
import type { ReferenceLine } from "@/lib/spectrum/types";

export function inventedLine(
  species: string,
  airNm: number,
  intensities: ReferenceLine["intensities"],
  extra: Partial<ReferenceLine> = {},
): ReferenceLine {
  const [element, stage] = species.split(" ");
  const roman = ["I", "II", "III", "IV", "V"].indexOf(stage ?? "");
  return {
    id: `${species}-${airNm}`,
    species,
    element,
    ionStage: roman >= 0 ? roman + 1 : null,
    airNm,
    vacuumNm: airNm * 1.00028,
    uncertaintyNm: 0.001,
    intensities,
    flags: {},
    ...extra,
  };
}

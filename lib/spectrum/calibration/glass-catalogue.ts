// Sellmeier coefficients of common prism glasses, so a physical prism model can name its glass.
//
// n² − 1 = Σ Bᵢ λ² / (λ² − Cᵢ), λ in µm, Cᵢ in µm². SCHOTT values are those of the SCHOTT optical
// glass catalogue data sheets (typed here from memory, and checked against the data sheets' n_d, n_F,
// n_C in the tests); fused silica is Malitson 1965 (J. Opt. Soc. Am. 55, 1205) and CaF₂ Malitson 1963
// (Appl. Opt. 2, 1103), also from memory, with Cᵢ given there as squared resonance wavelengths.
// A glass is only ever evaluated inside its validRangeNm (see glassesValidOver): below it the formula
// approaches an ultraviolet resonance (N-SF11's lies near 249.6 nm) and means nothing.

/** Sellmeier coefficients of one glass, with where they come from. */
export interface SellmeierGlass {
  /** The maker's glass name, e.g. "N-BK7". */
  name: string;
  /** B1, B2, B3 (dimensionless). */
  b: readonly [number, number, number];
  /** C1, C2, C3 in µm². */
  cUm2: readonly [number, number, number];
  /** Wavelength range over which the maker states the formula, in nm (approximate, from memory); calibration uses a glass only inside it. */
  validRangeNm: readonly [number, number];
  /** Citation for the coefficients. */
  source: string;
}

const SCHOTT = "SCHOTT optical glass catalogue, glass data sheet (from memory)";

/** The catalogue, keyed by glass name. */
export const GLASS_CATALOGUE = {
  "N-BK7": {
    name: "N-BK7",
    b: [1.03961212, 0.231792344, 1.01046945],
    cUm2: [0.00600069867, 0.0200179144, 103.560653],
    validRangeNm: [300, 2500],
    source: SCHOTT,
  },
  "N-SK16": {
    name: "N-SK16",
    b: [1.34317774, 0.241144399, 0.994317969],
    cUm2: [0.00704687339, 0.0229005, 92.7508526],
    validRangeNm: [310, 2500],
    source: SCHOTT,
  },
  F2: {
    name: "F2",
    b: [1.34533359, 0.209073176, 0.937357162],
    cUm2: [0.00997743871, 0.0470450767, 111.886764],
    validRangeNm: [320, 2500],
    source: SCHOTT,
  },
  "N-F2": {
    name: "N-F2",
    b: [1.39757037, 0.159201403, 1.2686543],
    cUm2: [0.00995906143, 0.0546931752, 119.248346],
    validRangeNm: [320, 2500],
    source: SCHOTT,
  },
  "N-SF5": {
    name: "N-SF5",
    b: [1.52481889, 0.187085527, 1.42729015],
    cUm2: [0.011254756, 0.0588995392, 129.141675],
    validRangeNm: [330, 2500],
    source: SCHOTT,
  },
  "N-SF10": {
    name: "N-SF10",
    b: [1.62153902, 0.256287842, 1.64447552],
    cUm2: [0.0122241457, 0.0595736775, 147.468793],
    validRangeNm: [380, 2500],
    source: SCHOTT,
  },
  "N-SF11": {
    name: "N-SF11",
    b: [1.73759695, 0.313747346, 1.89878101],
    cUm2: [0.013188707, 0.0623068142, 155.23629],
    validRangeNm: [370, 2500],
    source: SCHOTT,
  },
  SF10: {
    name: "SF10",
    b: [1.61625977, 0.259229334, 1.07762317],
    cUm2: [0.0127534559, 0.0581983954, 116.60768],
    validRangeNm: [380, 2500],
    source:
      "SCHOTT optical glass catalogue, data sheet SF10 (the lead-containing SF10; from memory)",
  },
  "N-BAK4": {
    name: "N-BAK4",
    b: [1.28834642, 0.132817724, 0.945395373],
    cUm2: [0.00779980626, 0.0315631177, 105.965875],
    validRangeNm: [320, 2500],
    source: SCHOTT,
  },
  CaF2: {
    name: "CaF2",
    b: [0.5675888, 0.4710914, 3.8484723],
    cUm2: [0.050263605 ** 2, 0.1003909 ** 2, 34.64904 ** 2],
    validRangeNm: [230, 9700],
    source: "Malitson 1963, Appl. Opt. 2, 1103, calcium fluoride at 24 °C (from memory)",
  },
  "fused-silica": {
    name: "fused-silica",
    b: [0.6961663, 0.4079426, 0.8974794],
    cUm2: [0.0684043 ** 2, 0.1162414 ** 2, 9.896161 ** 2],
    validRangeNm: [210, 3710],
    source: "Malitson 1965, J. Opt. Soc. Am. 55, 1205 (from memory)",
  },
} as const satisfies Record<string, SellmeierGlass>;

/** Names of the catalogue's glasses. */
export type GlassName = keyof typeof GLASS_CATALOGUE;

/** All catalogue glass names, in catalogue order. */
export const GLASS_NAMES = Object.keys(GLASS_CATALOGUE) as GlassName[];

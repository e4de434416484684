// The columns of Emberline's line-table CSV, in the order the formatter writes them, each with its meaning.
// The formatter writes these descriptions into the comment header of every exported file.

/** One CSV column: its header name and what a cell must hold. */
export interface LineTableColumn {
  /** Header name, exactly as it appears in the CSV. */
  name: string;
  /**
   * Where the value sits in a LineTableRow (and in a typed line), dotted for nested values:
   * "airNm", "intensities.flame", "band.extentNm". Field errors of a typed line use it.
   */
  field: string;
  /** True when every row must fill the cell. */
  required: boolean;
  /** What the cell holds, for the comment header. */
  description: string;
}

export const LINE_TABLE_COLUMNS: readonly LineTableColumn[] = [
  {
    name: "species",
    field: "species",
    required: true,
    description:
      'Element and ion stage in Roman numerals I-X ("Na I", "Ca II"), or a molecular formula ("CaOH", "BO2"; subscript digits are accepted).',
  },
  {
    name: "air_nm",
    field: "airNm",
    required: false,
    description:
      "Wavelength in standard air, nm. Blank below 200 nm (tables give vacuum there); computed from vacuum_nm when blank above.",
  },
  {
    name: "vacuum_nm",
    field: "vacuumNm",
    required: false,
    description:
      "Wavelength in vacuum, nm. Computed from air_nm when blank. At least one of air_nm and vacuum_nm is required; when both are given they must agree through the IAU conversion (Morton 2000, ApJS 130, 403).",
  },
  {
    name: "uncertainty_nm",
    field: "uncertaintyNm",
    required: false,
    description: "One-sigma uncertainty of the tabulated wavelength, nm.",
  },
  {
    name: "intensity_flame",
    field: "intensities.flame",
    required: false,
    description:
      "Relative intensity in a flame, on this table's scale (larger is stronger); blank where unknown.",
  },
  {
    name: "intensity_arc",
    field: "intensities.arc",
    required: false,
    description: "Relative intensity in a DC arc; blank where unknown.",
  },
  {
    name: "intensity_spark",
    field: "intensities.spark",
    required: false,
    description: "Relative intensity in a spark; blank where unknown.",
  },
  {
    name: "intensity_plasma",
    field: "intensities.plasma",
    required: false,
    description: "Relative intensity in an inductively coupled plasma; blank where unknown.",
  },
  {
    name: "intensity_lamp",
    field: "intensities.lamp",
    required: false,
    description: "Relative intensity in a discharge lamp of the element; blank where unknown.",
  },
  {
    name: "lower_ev",
    field: "lowerEv",
    required: false,
    description: "Lower-level energy, eV above the ground state of the species.",
  },
  {
    name: "upper_ev",
    field: "upperEv",
    required: false,
    description:
      "Upper-level energy, eV. With lower_ev it must match the photon energy hc/vacuum_nm.",
  },
  {
    name: "g_upper",
    field: "gUpper",
    required: false,
    description: "Statistical weight 2J+1 of the upper level (positive integer).",
  },
  {
    name: "a_per_s",
    field: "aPerS",
    required: false,
    description: "Transition probability (Einstein A), s^-1.",
  },
  {
    name: "flags",
    field: "flags",
    required: false,
    description:
      'Any of persistent, lamp, band-head, resonance, blend, separated by ";". lamp: a calibration lamp shows the line strongly; band-head: a molecular band head (needs band_extent_nm and band_degrades_to); blend: the tabulated value is a blend of unresolved components.',
  },
  {
    name: "band_extent_nm",
    field: "band.extentNm",
    required: false,
    description: "For band heads only: how far the band reaches from its head, nm.",
  },
  {
    name: "band_degrades_to",
    field: "band.degradesTo",
    required: false,
    description: 'For band heads only: "red" or "violet", the side towards which the band fades.',
  },
  {
    name: "source",
    field: "source",
    required: true,
    description: "Citation of the values (table, edition). Values typed from memory say so.",
  },
  {
    name: "verified",
    field: "verified",
    required: false,
    description:
      '"true" once a lab lead has checked the row against its source; "false" or blank otherwise.',
  },
  {
    name: "note",
    field: "note",
    required: false,
    description: "Free text: blends, conventions, cautions.",
  },
];

/** Column names in output order. */
export const LINE_TABLE_COLUMN_NAMES: readonly string[] = LINE_TABLE_COLUMNS.map((c) => c.name);

/**
 * The column that carries a line's identity across releases (a UUID). It is not one of
 * LINE_TABLE_COLUMNS: an export writes it first (formatLineTableCsv's `lineKeys`) and an import
 * reads it (parseLineTableCsv's `readLineKeys`); the starter table and a typed line have no key.
 */
export const LINE_KEY_COLUMN = "line_key";

// Shared shapes of the numerical core: spectra, peaks, reference lines and calibrations.
// Every stage of lib/spectrum speaks these types; nothing here does any work beyond naming a unit's kind.

/** What the first column of a spectrum measures. */
export type AxisUnit = "pixel" | "nm" | "angstrom" | "wavenumber";

/** Whether a wavelength is measured in air or in vacuum. */
export type WavelengthMedium = "air" | "vacuum";

export const WAVELENGTH_MEDIA = ["air", "vacuum"] as const satisfies readonly WavelengthMedium[];

/** Whether a first column in this unit holds wavelengths (which have a medium), not pixels or wavenumbers. */
export const isWavelengthUnit = (unit: string | null | undefined): boolean =>
  unit === "nm" || unit === "angstrom";

/**
 * What the first column of an instrument's exported files holds: pixel indices counted from 0 or
 * from 1 (the calibration maps the index, so the counting matters), or a spectral unit.
 */
export type FirstColumnKind = "pixel-from-0" | "pixel-from-1" | "nm" | "angstrom" | "wavenumber";

export const FIRST_COLUMN_KINDS: readonly FirstColumnKind[] = [
  "pixel-from-0",
  "pixel-from-1",
  "nm",
  "angstrom",
  "wavenumber",
];

/** How an instrument's files are read when they do not say what their first column holds. */
export interface ExportProfile {
  firstColumn: FirstColumnKind;
  /** Air or vacuum, for a wavelength column (nm or Å) only; null when not known. */
  medium: WavelengthMedium | null;
}

/** The kind of light source; expected relative intensities depend on it. */
export type SourceKind = "flame" | "arc" | "spark" | "plasma" | "lamp";

export const SOURCE_KINDS: readonly SourceKind[] = ["flame", "arc", "spark", "plasma", "lamp"];

/** How the instrument disperses light. */
export type DispersionKind = "grating" | "prism";

/** A spectrum as read from a file: x strictly increasing, y the counts at each x. */
export interface Spectrum {
  /** Abscissa, strictly increasing after parsing (the parser sorts descending files). */
  x: Float64Array;
  /** Counts (or intensity) at each x. */
  y: Float64Array;
  /** Unit of x as detected from the file or stated by the caller. */
  xUnit: AxisUnit;
  /** Medium of x when x is a wavelength; undefined for pixels and wavenumbers. */
  medium?: WavelengthMedium;
  /** Free-form metadata found in the file (JCAMP-DX labels, header cells). */
  meta: Record<string, string>;
}

/** One emission peak found in a spectrum, in the units of the spectrum's x axis. */
export interface Peak {
  /** Index of the sample nearest the centre. */
  index: number;
  /** Sub-sample centre, in x units (pixels or the file's wavelength axis). */
  x: number;
  /** One-sigma uncertainty of the centre, in x units. */
  xUncertainty: number;
  /** Height above the continuum, in counts. */
  height: number;
  /** Full width at half maximum, in x units. */
  fwhm: number;
  /** Area above the continuum, in counts × x units. */
  area: number;
  /** Height divided by the robust noise estimate. */
  snr: number;
  /** True when the top reaches the detector's maximum (height and centre are then less certain). */
  saturated: boolean;
  /** True when the peak is a shoulder of, or blended with, a neighbour. */
  blended: boolean;
  /** How the peak leans: (w₊ − w₋)/(w₊ + w₋), where w₊ and w₋ are its half-widths at half height
   * towards larger and smaller x. 0 for a symmetric line, towards +1 for a sharp edge on the low-x
   * side and a long tail to high x (a molecular band degraded that way). Absent when a flank is cut
   * by a neighbour or the array's end, or the top is clipped. */
  asymmetry?: number;
  /** The FWHM in samples of the array the peak finder read (after any binning): how finely the peak is
   * sampled. */
  fwhmSamples?: number;
}

/** Band-head details for molecular bands (CaOH, BO₂, …). */
export interface BandInfo {
  /** Width of the band from its head, in nm. */
  extentNm: number;
  /** Direction in which the band fades away from its head. */
  degradesTo: "red" | "violet";
}

/** One line (or band head) of the reference line table, as the core needs it. */
export interface ReferenceLine {
  /** Stable identifier from the line table (opaque to the core). */
  id: string;
  /** Species in the trade's notation: "Na I", "Ca II", or a molecule such as "CaOH". */
  species: string;
  /** Element symbol ("Na") or, for a molecule, its formula ("CaOH"). */
  element: string;
  /** 1 for neutral atoms (I), 2 for singly ionised (II), …; null for molecules. */
  ionStage: number | null;
  /** Air wavelength in nm (for lines below 200 nm tables give vacuum; see wavelengthForMatchingNm). */
  airNm: number;
  /** Vacuum wavelength in nm. */
  vacuumNm: number;
  /** One-sigma uncertainty of the tabulated wavelength, in nm. */
  uncertaintyNm: number;
  /** Relative intensity per kind of source, on the table's scale (larger is stronger). */
  intensities: Partial<Record<SourceKind, number>>;
  /** Upper-level energy in eV, where known. */
  upperEv?: number;
  /** Lower-level energy in eV, where known. */
  lowerEv?: number;
  /** Statistical weight of the upper level, where known. */
  g?: number;
  /** Transition probability in s⁻¹, where known. */
  a?: number;
  flags: {
    /** A persistent ("last to disappear") line of the element. */
    persistent?: boolean;
    /** A line a calibration lamp shows strongly enough to calibrate with. */
    lamp?: boolean;
    /** A molecular band head; see `band`. */
    bandHead?: boolean;
  };
  /** Present when flags.bandHead is set. */
  band?: BandInfo;
}

/** A pairing of an observed lamp peak with a known lamp line, used to fit a calibration. */
export interface CalibrationPair {
  /** Observed centre on the input axis (pixel, or the factory wavelength in nm). */
  x: number;
  /** One-sigma uncertainty of x, in x units. */
  xUncertainty?: number;
  /** Known wavelength in nm (air above 200 nm, vacuum below, as tables give it). */
  wavelengthNm: number;
  /** Species of the known line, e.g. "Hg I". */
  species?: string;
  /** Identifier of the known line in the line table. */
  lineId?: string;
}

/** A peak placed on the calibrated wavelength axis. */
export interface CalibratedPeak extends Peak {
  /** Centre wavelength in nm (air above 200 nm unless the axis says otherwise). */
  wavelengthNm: number;
  /** One-sigma uncertainty of the centre wavelength in nm: the peak's own centre uncertainty
   * propagated through the dispersion, combined with the calibration's uncertainty there. */
  wavelengthUncertaintyNm: number;
  /** Full width at half maximum in nm. */
  fwhmNm: number;
  /** The instrument's line-profile FWHM in nm at this peak (its slit image through the local
   * dispersion), where known; matching then uses it for the resolution term instead of one value
   * for the whole array. */
  resolutionNm?: number;
  /** True when the peak is several times wider than the instrument's line profile there (and not
   * saturated): too wide for one atomic line, so only molecular bands may explain it. */
  broad?: boolean;
  /** The peak's asymmetry (see Peak) towards longer wavelengths: positive when it has a sharp violet
   * edge and a tail to the red. Absent when the peak's asymmetry is. */
  redAsymmetry?: number;
}

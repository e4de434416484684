// Reads an uploaded file as one instrument's spectrum. What its first column holds comes from the file
// itself, else from what the uploader states, else from the instrument's export profile, else from
// values that are exactly the detector's pixel indices; with none of these it is refused, never
// guessed. A pixel axis is stored counted from 0 once its counting is known (calibrations map the
// index, so a lamp counted from 1 and a sample counted from 0 must not be mixed), the file is checked
// against the detector and the nominal range, and an instrument without a profile is offered one from
// a file whose header, or whose uploader, said what the first column holds.
import type {
  AxisUnit,
  ExportProfile,
  FirstColumnKind,
  Spectrum,
  WavelengthMedium,
} from "../types";
import { detectorPixelOrigin } from "./detector-pixel-origin";
import { parseSpectrumFile } from "./parse-spectrum-file";
import { spectrumFitToInstrument, type InstrumentFrame } from "./spectrum-fit-to-instrument";
import { isWavelengthUnit } from "../types";

export interface InstrumentExportFrame extends InstrumentFrame {
  /** How the instrument's files are read when they do not say; null while it has no profile. */
  exportProfile: ExportProfile | null;
}

export interface ReadInstrumentFileOptions {
  /**
   * What the uploader says the first column holds. Plain "pixel" leaves the counting to the values or
   * the profile. A file whose header says otherwise is refused ("unit-conflict").
   * @default undefined (not stated)
   */
  firstColumn?: FirstColumnKind | "pixel";
  /**
   * Air or vacuum, as the uploader states it for a wavelength column.
   * @default undefined (not stated)
   */
  medium?: WavelengthMedium;
  /**
   * Largest accepted input, in bytes of UTF-8.
   * @default 67108864 (64 MiB)
   */
  maxBytes?: number;
  /**
   * Largest accepted number of data points.
   * @default 2000000
   */
  maxPoints?: number;
}

/** What decided what the first column holds. */
export type FirstColumnSource = "file" | "stated" | "profile" | "pixel-count";

export interface InstrumentFileReading {
  /** The spectrum; a pixel axis is counted from 0 when its counting is known (firstColumn not null). */
  spectrum: Spectrum;
  /** What the file's first column held; null for pixels whose counting nothing tells. */
  firstColumn: FirstColumnKind | null;
  /** What decided the unit of the first column. */
  firstColumnFrom: FirstColumnSource;
  /** The profile to give an instrument that has none, from a file that said what it holds; else null. */
  proposedProfile: ExportProfile | null;
  /**
   * Why the file cannot be this instrument's, or null. `otherCounting` names the pixel counting under
   * which it would fit, when the counting was stated or came from the profile.
   */
  refusal: { message: string; otherCounting: FirstColumnKind | null } | null;
  /** Sentences to read before storing (the file can be stored). */
  warnings: string[];
}

const UNIT_OF: Record<FirstColumnKind | "pixel", AxisUnit> = {
  pixel: "pixel",
  "pixel-from-0": "pixel",
  "pixel-from-1": "pixel",
  nm: "nm",
  angstrom: "angstrom",
  wavenumber: "wavenumber",
};

const WORDS: Record<FirstColumnKind, string> = {
  "pixel-from-0": "pixel indices counted from 0",
  "pixel-from-1": "pixel indices counted from 1",
  nm: "wavelengths in nm",
  angstrom: "wavelengths in Å",
  wavenumber: "wavenumbers in cm⁻¹",
};

const SOURCE_OF: Record<string, FirstColumnSource> = {
  file: "file",
  caller: "stated",
  fallback: "profile",
  "pixel-count": "pixel-count",
};

function originOf(kind: FirstColumnKind | "pixel" | undefined): 0 | 1 | null {
  return kind === "pixel-from-0" ? 0 : kind === "pixel-from-1" ? 1 : null;
}

/** The file `text` as a spectrum of `instrument`; throws the parser's SpectrumParseError for a file it cannot read. */
export function readInstrumentFile(
  text: string,
  instrument: InstrumentExportFrame,
  options: ReadInstrumentFileOptions = {},
): InstrumentFileReading {
  const { firstColumn: stated, medium, maxBytes, maxPoints } = options;
  if (stated !== undefined && !(stated in UNIT_OF)) {
    throw new RangeError(`unknown firstColumn ${JSON.stringify(stated)}`);
  }
  const profile = instrument.exportProfile;
  const parsed = parseSpectrumFile(text, {
    xUnit: stated === undefined ? undefined : UNIT_OF[stated],
    medium,
    fallbackXUnit: profile ? UNIT_OF[profile.firstColumn] : undefined,
    fallbackMedium: profile?.medium ?? undefined,
    pixelCount: instrument.pixels,
    maxBytes,
    maxPoints,
  });
  const firstColumnFrom = SOURCE_OF[parsed.meta.xUnitSource] ?? "file";
  const warnings: string[] = [];

  let origin: 0 | 1 | null = null;
  let originFrom: "stated" | "profile" | "values" | null = null;
  if (parsed.xUnit === "pixel") {
    // Values that are exactly the detector's indices admit one counting only, so they outrank the
    // profile (which describes the usual file); what the uploader states outranks both, and is
    // refused below when the values contradict it.
    const fromValues = detectorPixelOrigin(parsed.x, instrument.pixels);
    const fromProfile = originOf(profile?.firstColumn);
    if (originOf(stated) !== null) [origin, originFrom] = [originOf(stated), "stated"];
    else if (fromValues !== null) [origin, originFrom] = [fromValues, "values"];
    else if (fromProfile !== null) [origin, originFrom] = [fromProfile, "profile"];
    if (originFrom === "values" && fromProfile !== null && fromProfile !== fromValues) {
      warnings.push(
        `This file counts its pixels from ${fromValues}, though ${instrument.name}'s export profile says its files ` +
          `count from ${fromProfile}; it is read counting from ${fromValues}.`,
      );
    }
  } else if (firstColumnFrom === "profile") {
    const indices = detectorPixelOrigin(parsed.x, instrument.pixels);
    if (indices !== null) {
      warnings.push(
        `This file's first column is the integers ${indices} to ${indices + instrument.pixels - 1}, as ` +
          `${instrument.name}'s pixel indices would be, but its export profile reads it as ` +
          `${WORDS[profile!.firstColumn]}: check the profile, or say what this file holds.`,
      );
    }
  }

  const refusal = pixelRefusal(parsed.x, instrument, origin, originFrom);
  const fit = spectrumFitToInstrument(parsed.x, parsed.xUnit, instrument, {
    pixelOrigin: origin ?? undefined,
  });
  const firstColumn: FirstColumnKind | null =
    parsed.xUnit === "pixel"
      ? origin === null
        ? null
        : origin === 0
          ? "pixel-from-0"
          : "pixel-from-1"
      : parsed.xUnit;

  const spectrum: Spectrum = { ...parsed, meta: { ...parsed.meta } };
  if (origin === 1) spectrum.x = parsed.x.map((value) => value - 1);
  if (firstColumn !== null) spectrum.meta.firstColumn = firstColumn;

  // A unit the file wrote in another form (µm read as nm) is not how its headerless files would be.
  const proposedProfile =
    profile === null &&
    (firstColumnFrom === "file" || firstColumnFrom === "stated") &&
    firstColumn !== null &&
    parsed.meta.xUnitInFile === undefined
      ? {
          firstColumn,
          medium: isWavelengthUnit(parsed.xUnit) ? (parsed.medium ?? null) : null,
        }
      : null;

  const refused = refusal ?? (fit.refusal ? { message: fit.refusal, otherCounting: null } : null);
  return {
    spectrum,
    firstColumn,
    firstColumnFrom,
    proposedProfile: refused ? null : proposedProfile,
    refusal: refused,
    warnings: refused ? [] : [...warnings, ...fit.warnings],
  };
}

/**
 * A pixel file that lies past the detector under the counting the uploader stated or the profile gave,
 * but would fit under the other counting: refused with that said, so that the uploader can state it.
 */
function pixelRefusal(
  x: Float64Array,
  instrument: InstrumentFrame,
  origin: 0 | 1 | null,
  originFrom: "stated" | "profile" | "values" | null,
): InstrumentFileReading["refusal"] {
  if (origin === null || (originFrom !== "stated" && originFrom !== "profile")) return null;
  const low = x[0];
  const high = x[x.length - 1];
  const fits = (from: number) => low >= from && high <= from + instrument.pixels - 1;
  if (fits(origin)) return null;
  const other = origin === 0 ? 1 : 0;
  if (!fits(other)) return null;
  const said =
    originFrom === "stated"
      ? "as stated for this upload"
      : `as ${instrument.name}'s export profile says`;
  return {
    message:
      `This file's first column runs over pixels ${low} to ${high}. Counted from ${origin}, ${said}, that goes past ` +
      `the ends of ${instrument.name}'s ${instrument.pixels.toLocaleString("en")} pixels (${origin} to ` +
      `${origin + instrument.pixels - 1}); counted from ${other} it fits.`,
    otherCounting: other === 0 ? "pixel-from-0" : "pixel-from-1",
  };
}

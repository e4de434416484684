// Public API of spectrum reading and writing: two-column text, JCAMP-DX, byte decoding and their errors.
export { SpectrumParseError } from "./spectrum-parse-error";
export type { SpectrumParseErrorCode } from "./spectrum-parse-error";
export { DEFAULT_MAX_BYTES, DEFAULT_MAX_POINTS, DEFAULT_MIN_POINTS } from "./spectrum-read-options";
export type { SpectrumReadOptions } from "./spectrum-read-options";
export { parseSpectrumText } from "./parse-spectrum-text";
export type { ParseSpectrumTextOptions } from "./parse-spectrum-text";
export type { TextDelimiter } from "./text-delimiter";
export { parseJcamp } from "./parse-jcamp";
export type { ParseJcampOptions } from "./parse-jcamp";
export { formatJcampDx } from "./format-jcamp-dx";
export type { FormatJcampDxOptions, JcampYUnits } from "./format-jcamp-dx";
export { JCAMP_Y_UNITS } from "./format-jcamp-dx";
export { resampleEvenly } from "./resample-evenly";
export type { ResampleEvenlyOptions } from "./resample-evenly";
export { parseSpectrumFile } from "./parse-spectrum-file";
export { isJcampText } from "./is-jcamp-text";
export type { ParseSpectrumFileOptions } from "./parse-spectrum-file";
export { decodeSpectrumBytes } from "./decode-spectrum-bytes";
export type { DecodeSpectrumBytesOptions } from "./decode-spectrum-bytes";
export { detectSpectrumTextEncoding } from "./detect-spectrum-text-encoding";
export type { SpectrumTextEncoding } from "./detect-spectrum-text-encoding";
export { suggestXUnit } from "./suggest-x-unit";
export type { SuggestXUnitOptions, XUnitSuggestion } from "./suggest-x-unit";
export { readAxisLabel } from "./read-axis-label";
export type { AxisLabelReading, LabelUnit } from "./read-axis-label";
export { parseNumberCell } from "./parse-number-cell";
export { spectrumFitToInstrument } from "./spectrum-fit-to-instrument";
export type { InstrumentFrame, SpectrumFit } from "./spectrum-fit-to-instrument";
export type { SpectrumFitOptions } from "./spectrum-fit-to-instrument";
export { detectorPixelOrigin } from "./detector-pixel-origin";
export { readInstrumentFile } from "./read-instrument-file";
export type {
  FirstColumnSource,
  InstrumentExportFrame,
  InstrumentFileReading,
  ReadInstrumentFileOptions,
} from "./read-instrument-file";

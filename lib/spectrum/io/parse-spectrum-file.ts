// Reads a spectrum file of either kind: JCAMP-DX when the text opens with ##LABEL= lines, two-column text otherwise.
import type { Spectrum } from "../types";
import { isJcampText } from "./is-jcamp-text";
import { parseJcamp, type ParseJcampOptions } from "./parse-jcamp";
import { parseSpectrumText, type ParseSpectrumTextOptions } from "./parse-spectrum-text";

export type ParseSpectrumFileOptions = ParseSpectrumTextOptions & ParseJcampOptions;

/** The spectrum in `text`, read by parseJcamp or parseSpectrumText (see those for options and errors). */
export function parseSpectrumFile(text: string, options: ParseSpectrumFileOptions = {}): Spectrum {
  if (typeof text !== "string") throw new RangeError("text must be a string");
  return isJcampText(text) ? parseJcamp(text, options) : parseSpectrumText(text, options);
}

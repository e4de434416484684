// Tells JCAMP-DX text from two-column text by its opening, for parseSpectrumFile.

/** Opens like a JCAMP-DX file: after a BOM and blank lines, a "##NAME=" label (a text comment "## …" has no "="). */
const JCAMP_OPENING = /^\uFEFF?\s*##[^=\r\n]*=/;

/** True when `text` opens with a JCAMP-DX label line. */
export function isJcampText(text: string): boolean {
  return JCAMP_OPENING.test(text.slice(0, 4096));
}

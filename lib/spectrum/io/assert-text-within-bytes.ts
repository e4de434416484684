// Refuses text over the byte limit before any work is done on it.
import { SpectrumParseError } from "./spectrum-parse-error";

/** Throws "too-large" when `text` takes more than `maxBytes` bytes as UTF-8. */
export function assertTextWithinBytes(text: string, maxBytes: number): void {
  if (!(maxBytes > 0)) throw new RangeError(`maxBytes must be positive, got ${String(maxBytes)}`);
  // Each UTF-16 unit is 1–3 UTF-8 bytes, so most texts are settled without counting.
  if (text.length * 3 <= maxBytes) return;
  let bytes = text.length > maxBytes ? maxBytes + 1 : 0;
  for (let i = 0; i < text.length && bytes <= maxBytes; i++) {
    const code = text.charCodeAt(i);
    if (code < 0x80) bytes += 1;
    else if (code < 0x800) bytes += 2;
    else if (code >= 0xd800 && code <= 0xdbff) {
      bytes += 4; // a surrogate pair is one 4-byte character
      i++;
    } else bytes += 3;
  }
  if (bytes > maxBytes) {
    throw new SpectrumParseError(
      "too-large",
      `the text is larger than the limit of ${maxBytes} bytes`,
    );
  }
}

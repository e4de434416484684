// Turns an uploaded file's bytes into text: UTF-8 (with or without BOM), UTF-16 with BOM, else Windows-1252.
// Windows-1252 is the fallback because older instrument software writes "Å" and "µ" in it, and it
// maps every byte, so decoding never fails; binary content is refused instead of decoded into garbage.
import { detectSpectrumTextEncoding } from "./detect-spectrum-text-encoding";
import { SpectrumParseError } from "./spectrum-parse-error";
import { DEFAULT_MAX_BYTES } from "./spectrum-read-options";

export interface DecodeSpectrumBytesOptions {
  /**
   * Largest accepted file, in bytes.
   * @default 67108864 (64 MiB)
   */
  maxBytes?: number;
}

/** The text of `bytes`, without its BOM. Throws "binary" for NUL bytes outside UTF-16, "too-large" over the limit. */
export function decodeSpectrumBytes(
  bytes: Uint8Array,
  options: DecodeSpectrumBytesOptions = {},
): string {
  const { maxBytes = DEFAULT_MAX_BYTES } = options;
  if (!(bytes instanceof Uint8Array)) throw new RangeError("bytes must be a Uint8Array");
  if (!Number.isInteger(maxBytes) || maxBytes < 1)
    throw new RangeError(`maxBytes must be a positive integer, got ${String(maxBytes)}`);
  if (bytes.length > maxBytes) {
    throw new SpectrumParseError(
      "too-large",
      `the file is ${bytes.length} bytes, over the limit of ${maxBytes}`,
    );
  }
  const encoding = detectSpectrumTextEncoding(bytes);
  if (encoding === "utf-16le" || encoding === "utf-16be") {
    const text = new TextDecoder(encoding).decode(bytes.subarray(2));
    if (text.includes("\u0000")) throw binaryError(null);
    return text;
  }
  const nul = bytes.indexOf(0);
  if (nul >= 0) throw binaryError(nul);
  if (encoding === "utf-8") return new TextDecoder("utf-8", { ignoreBOM: false }).decode(bytes);
  return new TextDecoder("windows-1252").decode(bytes);
}

function binaryError(offset: number | null): SpectrumParseError {
  const where = offset === null ? "" : ` (a NUL byte at offset ${offset})`;
  return new SpectrumParseError(
    "binary",
    `the file is binary, not text${where}; export the spectrum as text or JCAMP-DX`,
  );
}

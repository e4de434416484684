// Picks the text encoding of an uploaded file's bytes: a BOM where there is one, else UTF-8 if valid, else Windows-1252.

export type SpectrumTextEncoding = "utf-8" | "utf-16le" | "utf-16be" | "windows-1252";

/** Which encoding decodeSpectrumBytes will use for `bytes` (BOMs first, then whether the bytes are valid UTF-8). */
export function detectSpectrumTextEncoding(bytes: Uint8Array): SpectrumTextEncoding {
  if (bytes[0] === 0xff && bytes[1] === 0xfe) return "utf-16le";
  if (bytes[0] === 0xfe && bytes[1] === 0xff) return "utf-16be";
  try {
    new TextDecoder("utf-8", { fatal: true }).decode(bytes);
    return "utf-8";
  } catch {
    return "windows-1252";
  }
}

// The one zod string for every free-text field and query value: control characters (NUL and the
// other C0 codes but tab, line feed and carriage return; DEL) and lone UTF-16 surrogates are refused
// with a field message, because PostgreSQL cannot store NUL in text or a lone surrogate in jsonb
// (the audit trail), and neither belongs in a label, a name or a note.
import { z } from "zod";

export const UNCLEAN_TEXT_MESSAGE =
  "Remove control characters (such as NUL) and broken Unicode characters from this text.";

/** True when the text holds no control character but tab/LF/CR and no lone surrogate. */
export function isCleanText(value: string): boolean {
  for (let i = 0; i < value.length; i++) {
    const code = value.charCodeAt(i);
    if (code < 0x20) {
      if (code !== 0x09 && code !== 0x0a && code !== 0x0d) return false;
    } else if (code === 0x7f) {
      return false;
    } else if (code >= 0xd800 && code <= 0xdbff) {
      const next = value.charCodeAt(i + 1);
      if (!(next >= 0xdc00 && next <= 0xdfff)) return false;
      i++;
    } else if (code >= 0xdc00 && code <= 0xdfff) {
      return false;
    }
  }
  return true;
}

/**
 * Text for a file name or another value that is kept rather than refused: control characters
 * removed, lone surrogates replaced by U+FFFD (what a UTF-8 encoder writes for them anyway).
 */
export function cleanText(value: string): string {
  let out = "";
  for (let i = 0; i < value.length; i++) {
    const code = value.charCodeAt(i);
    if ((code < 0x20 && code !== 0x09 && code !== 0x0a && code !== 0x0d) || code === 0x7f) continue;
    if (code >= 0xd800 && code <= 0xdbff) {
      const next = value.charCodeAt(i + 1);
      if (next >= 0xdc00 && next <= 0xdfff) {
        out += value[i] + value[i + 1];
        i++;
      } else out += "\uFFFD";
    } else if (code >= 0xdc00 && code <= 0xdfff) out += "\uFFFD";
    else out += value[i];
  }
  return out;
}

/** `z.string(params)` that refuses unclean text; chain .trim(), .min(), .max() as usual. */
export function text(params?: Parameters<typeof z.string>[0]) {
  return z.string(params).refine(isCleanText, { message: UNCLEAN_TEXT_MESSAGE });
}

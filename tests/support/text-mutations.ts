// Damage that the readers' property and fuzz tests do to valid texts, as fast-check arbitraries, and
// the column layouts their valid texts are written in. Each test composes its own list in its own order.
import fc from "fast-check";

/** A change made to a text. */
export type TextMutation = (text: string) => string;

/** Separators and decimal marks of two-column text as instruments export it. */
export const TEXT_LAYOUTS = [
  { separator: ",", decimal: "." },
  { separator: ", ", decimal: "." },
  { separator: ";", decimal: "." },
  { separator: ";", decimal: "," },
  { separator: "\t", decimal: "." },
  { separator: "\t", decimal: "," },
  { separator: " ", decimal: "." },
  { separator: "   ", decimal: "," },
] as const;

/** The mutations both readers' tests use; `snippets` are inserted, characters up to `maxCharCode` replace one. */
export function textMutations(snippets: readonly string[], maxCharCode: number) {
  return {
    insertSnippet: fc
      .tuple(fc.nat(), fc.constantFrom(...snippets))
      .map(([at, snippet]): TextMutation => (text) => {
        const i = at % (text.length + 1);
        return text.slice(0, i) + snippet + text.slice(i);
      }),
    deleteSpan: fc
      .tuple(fc.nat(), fc.integer({ min: 1, max: 12 }))
      .map(([at, length]): TextMutation => (text) => {
        const i = at % (text.length + 1);
        return text.slice(0, i) + text.slice(i + length);
      }),
    replaceCharacter: fc
      .tuple(fc.nat(), fc.integer({ min: 0, max: maxCharCode }))
      .map(([at, code]): TextMutation => (text) => {
        const i = at % Math.max(1, text.length);
        return text.slice(0, i) + String.fromCharCode(code) + text.slice(i + 1);
      }),
    swapLines: fc.tuple(fc.nat(), fc.nat()).map(([a, b]): TextMutation => (text) => {
      const lines = text.split("\n");
      const i = a % lines.length;
      const j = b % lines.length;
      [lines[i], lines[j]] = [lines[j], lines[i]];
      return lines.join("\n");
    }),
    duplicateLine: fc.nat().map((a): TextMutation => (text) => {
      const lines = text.split("\n");
      const i = a % lines.length;
      lines.splice(i, 0, lines[i]);
      return lines.join("\n");
    }),
    truncate: fc.nat().map(
      (at): TextMutation =>
        (text) =>
          text.slice(0, at % (text.length + 1)),
    ),
  };
}

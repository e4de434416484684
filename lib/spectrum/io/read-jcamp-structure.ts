// Finds the labels and data blocks of a JCAMP-DX text in one pass over its lines, without splitting the
// whole text: data lines are only located here (offsets), so a file of millions of lines costs no memory.
import { SpectrumParseError } from "./spectrum-parse-error";

export interface ReadJcampStructureOptions {
  /**
   * Most labelled (##) lines accepted; real files hold tens, a LINK file of many blocks a few thousand.
   * @default 20000
   */
  maxLabels?: number;
}

export interface JcampLabel {
  /** The label as the standard compares it: spaces, "-" and "_" removed, upper case ("DATATYPE", "$MEDIUM"). */
  key: string;
  /** The label as written between "##" and "=", trimmed ("DATA TYPE", "$Medium"). */
  name: string;
  /** The value: trimmed, "$$" comments removed, continuation lines joined by "\n". */
  value: string;
  /** 1-based line of the label. */
  line: number;
}

export interface JcampDataBlock {
  form: "XYDATA" | "XYPOINTS" | "PEAKTABLE";
  /** The label's value, e.g. "(X++(Y..Y))". */
  variables: string;
  /** 1-based line of the ##XYDATA= / ##XYPOINTS= / ##PEAK TABLE= label. */
  labelLine: number;
  /** Offset in the text of the first data line, and of the end of the last (the next ## line or the end). */
  start: number;
  end: number;
  /** 1-based line at `start`. */
  firstLineNumber: number;
  /** The labels of the block's own section (from its ##TITLE= to its ##END=), data labels left out. */
  labels: JcampLabel[];
}

export interface JcampStructure {
  blocks: JcampDataBlock[];
  /** True when some line opens with "##": without any, the text is not JCAMP-DX at all. */
  hasLabelLines: boolean;
}

/** Longest label value kept, in characters. */
const MAX_VALUE_CHARS = 65_536;
const DATA_FORMS = new Set(["XYDATA", "XYPOINTS", "PEAKTABLE"]);
const LF = 10;
const CR = 13;

/** The data blocks of `text` (a BOM already removed) with their sections' labels, in file order. */
export function readJcampStructure(
  text: string,
  options: ReadJcampStructureOptions = {},
): JcampStructure {
  const { maxLabels = 20_000 } = options;
  if (!Number.isInteger(maxLabels) || maxLabels < 1)
    throw new RangeError(`maxLabels must be a positive integer, got ${String(maxLabels)}`);

  const labels: JcampLabel[] = [];
  /** Index in `labels` where each data block's section starts, and the data label's own index. */
  const pending: { block: Omit<JcampDataBlock, "labels">; sectionStart: number; at: number }[] = [];
  let sectionStart = 0;
  let hasLabelLines = false;
  /** The label whose value may continue on the next lines, or the data block being read. */
  let open: { label: JcampLabel; from: number; to: number } | null = null;
  let openBlock: Omit<JcampDataBlock, "labels"> | null = null;

  const length = text.length;
  let position = 0;
  let line = 1;
  while (position <= length) {
    let end = position;
    while (end < length) {
      const code = text.charCodeAt(end);
      if (code === LF || code === CR) break;
      end++;
    }
    const next =
      end >= length
        ? length + 1
        : text.charCodeAt(end) === CR && text.charCodeAt(end + 1) === LF
          ? end + 2
          : end + 1;

    let first = position;
    while (first < end && (text.charCodeAt(first) === 32 || text.charCodeAt(first) === 9)) first++;
    const isLabelLine = text.charCodeAt(first) === 35 && text.charCodeAt(first + 1) === 35; // "##"
    if (isLabelLine) {
      hasLabelLines = true;
      if (open) finishValue(text, open);
      open = null;
      if (openBlock) openBlock.end = position;
      openBlock = null;
      // Searched within the line only: indexOf would run on through the file for each "##" line without "=".
      let equals = first + 2;
      while (equals < end && text.charCodeAt(equals) !== 61) equals++;
      if (equals < end) {
        if (labels.length >= maxLabels) {
          throw new SpectrumParseError(
            "too-large",
            `more than ${maxLabels} labelled lines; this reader takes no more`,
            line,
            null,
          );
        }
        const name = text.slice(first + 2, equals).trim();
        const key = name.replace(/[\s_-]/g, "").toUpperCase();
        const label: JcampLabel = { key, name, value: "", line };
        if (key === "TITLE") sectionStart = labels.length;
        labels.push(label);
        if (DATA_FORMS.has(key)) {
          label.value = stripComment(text.slice(equals + 1, end)).trim();
          openBlock = {
            form: key as JcampDataBlock["form"],
            variables: label.value,
            labelLine: line,
            start: Math.min(next, length),
            end: length,
            firstLineNumber: line + 1,
          };
          pending.push({ block: openBlock, sectionStart, at: labels.length - 1 });
        } else {
          open = { label, from: equals + 1, to: end };
        }
      }
    } else if (open) {
      open.to = end;
    }
    position = next;
    line++;
  }
  if (open) finishValue(text, open);

  const blocks = pending.map(({ block, sectionStart: from, at }) => {
    // The section ends at the next ##END= or ##TITLE= after the data label.
    let to = at + 1;
    while (to < labels.length && labels[to].key !== "END" && labels[to].key !== "TITLE") to++;
    const own = labels.slice(from, to).filter((label) => !DATA_FORMS.has(label.key));
    return { ...block, labels: own };
  });
  return { blocks, hasLabelLines };
}

/**
 * The value from the label's "=" to the end of its last continuation line. Only the first
 * MAX_VALUE_CHARS are kept (values are metadata; the raw file is kept elsewhere), and no regex
 * runs over it, so a hostile value of millions of blanks or lines costs linear time.
 */
function finishValue(text: string, open: { label: JcampLabel; from: number; to: number }): void {
  const to = Math.min(open.to, open.from + MAX_VALUE_CHARS);
  let value = text
    .slice(open.from, to)
    .split(/\r\n|\r|\n/)
    .map((part) => stripComment(part).trimEnd())
    .join("\n")
    .trim();
  if (to < open.to) value += ` … (cut at ${MAX_VALUE_CHARS} characters)`;
  open.label.value = value;
}

/** "$$" starts a comment that runs to the end of the line. */
function stripComment(part: string): string {
  const comment = part.indexOf("$$");
  return comment < 0 ? part : part.slice(0, comment);
}

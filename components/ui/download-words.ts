// The words and the file name of a download button (pure, so unit tests read them): what is being
// prepared, that it is saved, and a failure as a sentence with the server's own reason.

/** The file name a reply's `Content-Disposition` gives (`filename="…"` or RFC 6266 `filename*=`), else `fallback`. */
export function fileNameFromDisposition(header: string | null, fallback: string): string {
  if (!header) return fallback;
  const extended = /filename\*\s*=\s*(?:UTF-8|utf-8)''([^;]+)/.exec(header);
  if (extended) {
    try {
      return decodeURIComponent(extended[1].trim());
    } catch {
      // A malformed escape: fall through to the plain form.
    }
  }
  const plain = /filename\s*=\s*"([^"]*)"|filename\s*=\s*([^;]+)/.exec(header);
  const name = (plain?.[1] ?? plain?.[2] ?? "").trim();
  // Never a path: a name with a separator keeps its last part.
  return name.split(/[\\/]/).pop() || fallback;
}

/** "Preparing the PDF…", then with the seconds waited once the wait is noticeable. */
export function preparingText(what: string, seconds: number): string {
  return seconds >= 2 ? `Preparing the ${what}… ${seconds} s so far.` : `Preparing the ${what}…`;
}

export function readyText(fileName: string): string {
  return `Ready — saved as ${fileName}.`;
}

/** A failed download as one sentence, with the server's reason when it gave one. */
export function failureText(what: string, status: number | null, reason: string | null): string {
  const why = reason?.trim();
  if (status === null)
    return `The ${what} could not be downloaded: the server did not answer. Check the connection and try again.`;
  if (why)
    return `The ${what} could not be prepared: ${lowerFirst(why)}${/[.!?]$/.test(why) ? "" : "."}`;
  return `The ${what} could not be prepared (HTTP ${status}). Try again in a moment.`;
}

function lowerFirst(sentence: string): string {
  // "No such run." reads "no such run." after a colon; an acronym ("PDF …") keeps its capitals.
  return /^[A-Z][a-z]/.test(sentence) ? sentence[0].toLowerCase() + sentence.slice(1) : sentence;
}

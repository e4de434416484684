// The one reader of request bodies: a cap per route checked on Content-Length at once and on a
// running byte count while the stream is read (chunked bodies), and a deadline for slow senders.
// `apiRoute` reads the body this way before any authentication work; parseJson and the multipart
// and text readers take the bytes it read.
import { AppError } from "@/lib/errors";

/** Sign-in, password reset requests: an e-mail address and a password fit in far less. */
export const SIGN_IN_BODY_BYTES = 4 * 1024;
/** Account changes (password change, reset confirmation, invitations, tokens). */
export const ACCOUNT_BODY_BYTES = 8 * 1024;
/** Every other JSON body unless its route says more (notes of 20,000 characters fit with room). */
export const JSON_BODY_BYTES = 128 * 1024;
/** A slow sender gets this long for the whole body before a 408. */
export const BODY_TIMEOUT_MS = Number(process.env.EMBERLINE_BODY_TIMEOUT_MS ?? 30_000);

export interface ReadBodyOptions {
  /** Largest body accepted, in bytes. */
  maxBytes: number;
  /**
   * Time allowed for the whole body, in milliseconds.
   * @default BODY_TIMEOUT_MS (30 s, or EMBERLINE_BODY_TIMEOUT_MS)
   */
  timeoutMs?: number;
  /**
   * The 413's sentence, when the route can name its cap better (e.g. the file size of an upload).
   * @default "The request body is larger than the <cap> this address accepts."
   */
  tooLargeMessage?: string;
}

/** "4 KB", "16 MB": the cap as a person reads it (binary multiples, as the caps are set). */
export function formatByteCap(bytes: number): string {
  if (bytes >= 1024 * 1024) return `${Number((bytes / (1024 * 1024)).toFixed(1))} MB`;
  if (bytes >= 1024) return `${Number((bytes / 1024).toFixed(1))} KB`;
  return `${bytes} bytes`;
}

export function tooLarge(maxBytes: number, message?: string): AppError {
  return new AppError(
    "too_large",
    message ??
      `The request body is larger than the ${formatByteCap(maxBytes)} this address accepts.`,
  );
}

const bodies = new WeakMap<Request, Promise<Uint8Array>>();

/**
 * Reads the whole body once (later calls get the same bytes). Refuses a declared Content-Length over
 * the cap before reading anything, stops reading as soon as the running count passes it, and gives up
 * after the deadline.
 */
export function readBody(request: Request, options: ReadBodyOptions): Promise<Uint8Array> {
  let pending = bodies.get(request);
  if (!pending) {
    pending = readCapped(request, options);
    bodies.set(request, pending);
  }
  return pending;
}

/** The bytes `apiRoute` already read, or a read with the default JSON cap. */
export function bodyBytes(request: Request): Promise<Uint8Array> {
  return readBody(request, { maxBytes: JSON_BODY_BYTES });
}

export async function bodyText(request: Request): Promise<string> {
  const bytes = await bodyBytes(request);
  try {
    return new TextDecoder("utf-8", { fatal: true }).decode(bytes);
  } catch {
    throw new AppError("validation", "The request body is not valid UTF-8 text.");
  }
}

async function readCapped(
  request: Request,
  { maxBytes, timeoutMs = BODY_TIMEOUT_MS, tooLargeMessage }: ReadBodyOptions,
): Promise<Uint8Array> {
  const declared = request.headers.get("content-length");
  if (declared !== null) {
    const length = Number(declared);
    if (!Number.isSafeInteger(length) || length < 0)
      throw new AppError("validation", "The Content-Length header is not a number.");
    if (length > maxBytes) throw tooLarge(maxBytes, tooLargeMessage);
  }
  if (!request.body) return new Uint8Array(0);
  const reader = request.body.getReader();
  const chunks: Uint8Array[] = [];
  let total = 0;
  let timer: ReturnType<typeof setTimeout> | undefined;
  const deadline = new Promise<never>((_, reject) => {
    timer = setTimeout(
      () =>
        reject(
          new AppError(
            "timeout",
            `The request body did not arrive within ${Math.round(timeoutMs / 1000)} s.`,
          ),
        ),
      timeoutMs,
    );
  });
  try {
    for (;;) {
      const { done, value } = await Promise.race([reader.read(), deadline]);
      if (done) break;
      total += value.byteLength;
      if (total > maxBytes) throw tooLarge(maxBytes, tooLargeMessage);
      chunks.push(value);
    }
  } catch (error) {
    // Stop the sender: the rest of the body is not wanted.
    reader.cancel().catch(() => {});
    if (error instanceof AppError) throw error;
    throw new AppError("validation", "The request body could not be read.");
  } finally {
    clearTimeout(timer);
  }
  const bytes = new Uint8Array(total);
  let offset = 0;
  for (const chunk of chunks) {
    bytes.set(chunk, offset);
    offset += chunk.byteLength;
  }
  return bytes;
}

// The one body reader: a declared length over the cap is refused before anything is read, a chunked
// body is read with a running count and abandoned as soon as it passes the cap, a slow body times out,
// and a body within the cap comes back byte for byte (once, however often it is asked for).
import { describe, expect, it } from "vitest";
import { AppError } from "@/lib/errors";
import { bodyText, formatByteCap, readBody } from "@/lib/http/read-body";

/** A request whose body is produced chunk by chunk; `pulled` counts the chunks the reader asked for. */
function streamingRequest(
  chunkBytes: number,
  chunks: number,
  { delayMs = 0, headers = {} as Record<string, string> } = {},
) {
  const state = { pulled: 0, cancelled: false };
  const body = new ReadableStream<Uint8Array>(
    {
      async pull(controller) {
        if (state.pulled === chunks) return controller.close();
        state.pulled++;
        if (delayMs) await new Promise((resolve) => setTimeout(resolve, delayMs));
        controller.enqueue(new Uint8Array(chunkBytes).fill(120));
      },
      cancel() {
        state.cancelled = true;
      },
    },
    { highWaterMark: 0 },
  );
  const request = new Request("http://127.0.0.1/api/x", {
    method: "POST",
    body,
    headers,
    duplex: "half",
  } as RequestInit);
  return { request, state };
}

async function failure(promise: Promise<unknown>): Promise<AppError> {
  const error = await promise.then(
    () => null,
    (e: unknown) => e,
  );
  expect(error).toBeInstanceOf(AppError);
  return error as AppError;
}

describe("readBody", () => {
  it("refuses a declared Content-Length over the cap without reading the body", async () => {
    const { request, state } = streamingRequest(1024, 100, {
      headers: { "content-length": String(100 * 1024) },
    });
    const error = await failure(readBody(request, { maxBytes: 4096 }));
    expect(error.status).toBe(413);
    expect(error.message).toBe("The request body is larger than the 4 KB this address accepts.");
    expect(state.pulled).toBe(0);
  });

  it("stops reading a chunked body as soon as the running count passes the cap", async () => {
    const { request, state } = streamingRequest(1024, 10_000);
    const error = await failure(readBody(request, { maxBytes: 8 * 1024 }));
    expect(error.status).toBe(413);
    // 9 chunks pass the 8 KB cap; the stream may have queued one or two more, never the 10,000.
    expect(state.pulled).toBeLessThan(12);
    expect(state.cancelled).toBe(true);
  });

  it("answers 408 when the body does not arrive in time", async () => {
    const { request, state } = streamingRequest(10, 100, { delayMs: 40 });
    const error = await failure(readBody(request, { maxBytes: 1_000_000, timeoutMs: 150 }));
    expect(error.status).toBe(408);
    expect(error.message).toMatch(/did not arrive within/);
    expect(state.pulled).toBeLessThan(100);
  });

  it("returns a body within the cap byte for byte, and the same bytes to a second reader", async () => {
    const { request } = streamingRequest(1000, 5);
    const bytes = await readBody(request, { maxBytes: 5000 });
    expect(bytes.byteLength).toBe(5000);
    expect(bytes.every((b) => b === 120)).toBe(true);
    expect(await bodyText(request)).toBe("x".repeat(5000));
  });

  it("uses the route's own sentence for the 413 when it has one", async () => {
    const request = new Request("http://127.0.0.1/api/x", {
      method: "POST",
      body: "x".repeat(100),
    });
    const error = await failure(
      readBody(request, { maxBytes: 10, tooLargeMessage: "Files of up to 16 MB." }),
    );
    expect(error.message).toBe("Files of up to 16 MB.");
  });

  it("refuses bytes that are not UTF-8 where text is expected", async () => {
    const request = new Request("http://127.0.0.1/api/x", {
      method: "POST",
      body: new Uint8Array([0x7b, 0xc0, 0xaf, 0x7d]),
    });
    expect((await failure(bodyText(request))).status).toBe(400);
  });
});

describe("formatByteCap", () => {
  it("names caps as people read them", () => {
    expect(formatByteCap(4 * 1024)).toBe("4 KB");
    expect(formatByteCap(6 * 1024 * 1024)).toBe("6 MB");
    expect(formatByteCap(500)).toBe("500 bytes");
  });
});

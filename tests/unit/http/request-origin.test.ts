// Same site or not: the Origin's host against the host the request was sent to, as Next.js compares
// them for server actions (common practice for CSRF checks; OWASP's CSRF cheat sheet describes it, from
// memory).
import { describe, expect, it } from "vitest";
import { originVerdict } from "@/lib/http/request-origin";

const request = (headers: Record<string, string>) => new Headers(headers);

describe("originVerdict", () => {
  it("has nothing to judge without an Origin", () => {
    expect(originVerdict(request({ host: "lab.example:3000" }))).toBe("absent");
  });

  it("accepts a page of the same host and port", () => {
    expect(
      originVerdict(request({ origin: "http://lab.example:3000", host: "lab.example:3000" })),
    ).toBe("same");
  });

  it("compares with the first host a proxy forwarded, when there is one", () => {
    const behindProxy = {
      origin: "https://emberline.lab.example",
      host: "10.0.0.5:3000",
      "x-forwarded-host": "emberline.lab.example, 10.0.0.2",
    };
    expect(originVerdict(request(behindProxy))).toBe("same");
    expect(originVerdict(request({ ...behindProxy, "x-forwarded-host": "other.example" }))).toBe(
      "foreign",
    );
  });

  it("refuses another site, another port and an Origin that is no URL", () => {
    expect(originVerdict(request({ origin: "https://evil.example", host: "lab.example" }))).toBe(
      "foreign",
    );
    expect(
      originVerdict(request({ origin: "http://lab.example:4000", host: "lab.example:3000" })),
    ).toBe("foreign");
    expect(originVerdict(request({ origin: "null", host: "lab.example" }))).toBe("malformed");
  });
});

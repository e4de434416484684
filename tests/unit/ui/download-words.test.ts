// The download button's words and file name: the server's name is kept (never a path), the wait is
// said with its seconds, and a failure is one sentence carrying the server's reason.
import { describe, expect, it } from "vitest";
import {
  failureText,
  fileNameFromDisposition,
  preparingText,
  readyText,
} from "@/components/ui/download-words";

describe("fileNameFromDisposition", () => {
  it("reads the quoted, bare and RFC 6266 extended forms", () => {
    expect(
      fileNameFromDisposition('attachment; filename="emberline-run-1a2b3c4d-v1.pdf"', "x"),
    ).toBe("emberline-run-1a2b3c4d-v1.pdf");
    expect(fileNameFromDisposition("attachment; filename=calls.csv", "x")).toBe("calls.csv");
    expect(
      fileNameFromDisposition(
        "attachment; filename=\"a.csv\"; filename*=UTF-8''Spektrum%20%C3%A4.jdx",
        "x",
      ),
    ).toBe("Spektrum ä.jdx");
  });

  it("falls back without a header or a name, and keeps only the last part of a path", () => {
    expect(fileNameFromDisposition(null, "fallback.pdf")).toBe("fallback.pdf");
    expect(fileNameFromDisposition("attachment", "fallback.pdf")).toBe("fallback.pdf");
    expect(fileNameFromDisposition('attachment; filename="../../etc/passwd"', "f")).toBe("passwd");
    expect(fileNameFromDisposition('attachment; filename="dir/"', "f")).toBe("f");
  });
});

describe("the status sentences", () => {
  it("says what is prepared, with the seconds once the wait is noticeable", () => {
    expect(preparingText("PDF", 0)).toBe("Preparing the PDF…");
    expect(preparingText("PDF", 1)).toBe("Preparing the PDF…");
    expect(preparingText("PDF", 5)).toBe("Preparing the PDF… 5 s so far.");
    expect(readyText("run.pdf")).toBe("Ready — saved as run.pdf.");
  });

  it("words a failure as one sentence, with the server's reason when it gave one", () => {
    expect(failureText("PDF", 404, "No such run.")).toBe(
      "The PDF could not be prepared: no such run.",
    );
    expect(failureText("PDF", 503, "PDF reports are busy, try again")).toBe(
      "The PDF could not be prepared: PDF reports are busy, try again.",
    );
    expect(failureText("peaks CSV", 500, null)).toBe(
      "The peaks CSV could not be prepared (HTTP 500). Try again in a moment.",
    );
    expect(failureText("PDF", null, null)).toMatch(/^The PDF could not be downloaded: .*\.$/);
  });
});

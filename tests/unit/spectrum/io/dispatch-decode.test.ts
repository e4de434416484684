// Checks that files are sent to the right reader and that uploaded bytes decode to the right text.
import { describe, it, expect } from "vitest";
import { readFileSync } from "node:fs";
import path from "node:path";
import {
  SpectrumParseError,
  decodeSpectrumBytes,
  detectSpectrumTextEncoding,
  isJcampText,
  parseSpectrumFile,
} from "../../../../lib/spectrum/io";

const FIXTURES = path.resolve(__dirname, "../../../fixtures/spectra");

describe("parseSpectrumFile", () => {
  it("reads JCAMP-DX by its ## labels and text otherwise", () => {
    const jcamp = parseSpectrumFile(
      readFileSync(path.join(FIXTURES, "lamp-difdup-compressed.jdx"), "utf8"),
    );
    expect(jcamp.meta.JCAMPDX).toBe("4.24");
    const text = parseSpectrumFile(
      readFileSync(path.join(FIXTURES, "wavenumber-descending.csv"), "utf8"),
    );
    expect(text.meta.delimiter).toBe("comma");
  });

  it("treats a '## note' comment without '=' as text", () => {
    expect(isJcampText("\uFEFF\n  ##TITLE=x\n")).toBe(true);
    expect(isJcampText("## pixel counts\n0 1\n")).toBe(false);
    const rows = Array.from({ length: 20 }, (_, i) => `${i} ${i * 2}`).join("\n");
    expect(parseSpectrumFile(`## pixel counts\n${rows}`).xUnit).toBe("pixel");
  });
});

describe("decodeSpectrumBytes", () => {
  const utf8 = (text: string) => new TextEncoder().encode(text);

  it("decodes UTF-8 with and without a BOM", () => {
    expect(decodeSpectrumBytes(utf8("λ/Å\tµm"))).toBe("λ/Å\tµm");
    expect(decodeSpectrumBytes(new Uint8Array([0xef, 0xbb, 0xbf, ...utf8("Å,1")]))).toBe("Å,1");
  });

  it("falls back to Windows-1252 so that Å and µ survive", () => {
    // Windows-1252 code page: 0xC5 is Å, 0xB5 is µ (common practice)
    const bytes = new Uint8Array([0x6c, 0x2f, 0xc5, 0x09, 0xb5, 0x6d]);
    expect(detectSpectrumTextEncoding(bytes)).toBe("windows-1252");
    expect(decodeSpectrumBytes(bytes)).toBe("l/Å\tµm");
  });

  it("decodes UTF-16 with a BOM", () => {
    const le = new Uint8Array([0xff, 0xfe, 0x41, 0x00, 0xc5, 0x00]);
    expect(decodeSpectrumBytes(le)).toBe("AÅ");
    const be = new Uint8Array([0xfe, 0xff, 0x00, 0x41, 0x00, 0xc5]);
    expect(decodeSpectrumBytes(be)).toBe("AÅ");
  });

  it("refuses binary content and oversized files", () => {
    const binary = new Uint8Array([0x50, 0x4b, 0x03, 0x04, 0x00, 0x00, 0x08]);
    expect(() => decodeSpectrumBytes(binary)).toThrow(SpectrumParseError);
    try {
      decodeSpectrumBytes(binary);
    } catch (error) {
      expect((error as SpectrumParseError).code).toBe("binary");
      expect((error as SpectrumParseError).message).toMatch(/offset 4/);
    }
    expect(() => decodeSpectrumBytes(utf8("0 1\n"), { maxBytes: 2 })).toThrow(/limit/);
  });
});

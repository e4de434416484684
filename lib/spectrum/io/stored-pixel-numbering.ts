// How a stored pixel axis counts its pixels, and whether a calibration's lamp and a sample count them
// alike. Uploads whose counting is known (a header, the uploader's word, the instrument's export
// profile, or a column of exactly the detector's indices) are stored counted from 0 and say so in
// meta.firstColumn; uploads stored before that keep the file's own numbers. A calibration maps the
// numbers its lamp was stored with, so an older lamp counted from 1 applied to a sample stored from 0
// would put every line one pixel off, silently.

/** "known": stored from 0 with its counting recorded; "file-from-1": an older upload whose file counted from 1; "file": any other older upload (or not a pixel axis). */
export type StoredPixelNumbering = "known" | "file-from-1" | "file";

export interface StoredAxisFacts {
  xUnit: string;
  /** The counting recorded at upload (meta.firstColumn), if any. */
  firstColumn?: string | null;
  /** The smallest stored x value. */
  minX: number;
}

export function storedPixelNumbering(axis: StoredAxisFacts): StoredPixelNumbering {
  if (axis.xUnit !== "pixel") return "file";
  if (axis.firstColumn) return "known";
  return axis.minX === 1 ? "file-from-1" : "file";
}

/** True when a calibration made on `lamp` would map `sample`'s pixels one pixel off. */
export function pixelNumberingDiffers(lamp: StoredAxisFacts, sample: StoredAxisFacts): boolean {
  const a = storedPixelNumbering(lamp);
  const b = storedPixelNumbering(sample);
  return (a === "known" && b === "file-from-1") || (a === "file-from-1" && b === "known");
}

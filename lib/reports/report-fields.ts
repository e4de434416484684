// The labelled facts of a report's calibration, release and signature blocks: the page and the PDF
// show the same fields in the same words from here.
import { formatUtc, type ReportField, type ReportSignature, type RunReport } from "./report-model";

/** The calibration block's fields, with the sample's range against the range it covers. */
export function calibrationFields(
  c: NonNullable<RunReport["calibration"]>,
  report: Pick<RunReport, "rangeNm" | "outsideCoveredRange">,
): ReportField[] {
  return [
    { label: "Model", value: c.model },
    { label: "RMS", value: `${c.rmsNm.toFixed(4)} nm` },
    {
      label: "Covered range",
      value: `${c.coveredRangeNm[0].toFixed(2)}–${c.coveredRangeNm[1].toFixed(2)} nm`,
    },
    {
      label: "Sample range",
      value: `${report.rangeNm[0].toFixed(2)}–${report.rangeNm[1].toFixed(2)} nm${report.outsideCoveredRange ? " (extends past the covered range)" : ""}`,
    },
    {
      label: "Lamp lines used",
      value: `${c.pairCount} (${c.rejectedCount} rejected as outliers)`,
    },
    { label: "Lamps", value: c.lamps.join(", ") || "–" },
    { label: "Median uncertainty", value: `${c.medianUncertaintyNm.toFixed(4)} nm` },
    { label: "Calibrated on", value: c.calibratedOn },
    { label: "Calibration id", value: c.id },
  ];
}

/** The line-table release block's fields. */
export function releaseFields(release: RunReport["release"]): ReportField[] {
  return [
    {
      label: "Release",
      value: release.number === null ? "unnumbered" : `release ${release.number}`,
    },
    {
      label: "Published",
      value: release.publishedAt ? formatUtc(release.publishedAt) : "–",
    },
    { label: "Release id", value: release.id },
  ];
}

/** Who signed, with what meaning, when and in which round (the content hash is shown apart, in mono). */
export function signatureFields(signature: ReportSignature): ReportField[] {
  return [
    { label: "Signed by", value: signature.signerName },
    { label: "Meaning", value: signature.meaning },
    { label: "Signed at", value: formatUtc(signature.signedAt) },
    { label: "Review round", value: String(signature.round) },
  ];
}

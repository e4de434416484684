// The shapes the line-library services return to pages and route handlers: releases, lines,
// import previews and release comparisons. Plain objects, no Sequelize instances.
import type { LineFlag, LineTableError, LineTableRow, ReferencePairing } from "@/lib/lines";
import type { SourceKind, WavelengthMedium } from "@/lib/spectrum/types";

export type ReleaseStatus = "draft" | "published";

export interface ReleaseSummary {
  id: string;
  teamId: string;
  /** 1, 2, … for published releases; null for the draft. */
  number: number | null;
  status: ReleaseStatus;
  notes: string;
  /** The release the draft was started from (null for the first). */
  basedOnReleaseId: string | null;
  lineCount: number;
  createdByName: string | null;
  publishedByName: string | null;
  publishedAt: string | null;
  createdAt: string;
}

/**
 * One line as the API and the pages see it (the public shape of GET /api/lines): the table's row
 * (g and a under their API names) with its identity, verification and draft state.
 */
export interface LineRecord extends Omit<LineTableRow, "gUpper" | "aPerS"> {
  /** This row's id (one row per release). */
  id: string;
  /** The line's identity across releases: the same physical line keeps its key when corrected. */
  lineKey: string;
  releaseId: string;
  /** LineTableRow's gUpper. */
  g: LineTableRow["gUpper"];
  /** LineTableRow's aPerS. */
  a: LineTableRow["aPerS"];
  verifiedByName: string | null;
  verifiedAt: string | null;
  /** The reference citation a reference check verified the line against; null otherwise. */
  verifiedCitation: string | null;
  /** True for a line retired in the draft: it is left out when the draft is published. */
  retired: boolean;
  /** Optimistic-locking version: send it back with every edit. */
  version: number;
}

export type LineSortKey = "wavelength" | "species" | "intensity";

export interface LineQuery {
  teamId: string;
  /** Default: the team's newest published release. */
  releaseId?: string;
  /** A published release by its number (used when releaseId is not given). */
  releaseNumber?: number;
  /** Range in nm, compared with the tabulated wavelength (air above 200 nm, vacuum below) unless `vacuum`. */
  minNm?: number;
  maxNm?: number;
  /** Compare minNm/maxNm with vacuum wavelengths instead of the tabulated ones. Default false. */
  vacuum?: boolean;
  /** Exact species in the trade's notation ("Na I"). */
  species?: string;
  /** Element symbol or molecular formula ("Na", "CaOH"). */
  element?: string;
  /** Only lines with a relative intensity for this kind of source. */
  source?: SourceKind;
  flag?: LineFlag;
  verified?: boolean;
  sort?: LineSortKey;
  direction?: "asc" | "desc";
  /** 1-based. */
  page?: number;
  /** At most 500. */
  pageSize?: number;
}

export interface LinePage {
  release: Pick<ReleaseSummary, "id" | "number" | "status" | "publishedAt">;
  lines: LineRecord[];
  total: number;
  page: number;
  pageSize: number;
}

/** The values a lab lead types for a line (the CSV row shape, without derived fields). */
export type LineInput = Omit<LineTableRow, "element" | "ionStage" | "verified">;

export interface ImportChange {
  lineId: string;
  lineKey: string;
  /** 1-based line of the CSV row. */
  csvLine: number;
  before: LineTableRow;
  after: LineTableRow;
  /** Names of the fields that differ. */
  fields: string[];
}

export interface ImportPreview {
  releaseId: string;
  adds: { csvLine: number; row: LineTableRow }[];
  changes: ImportChange[];
  unchangedCount: number;
  errors: LineTableError[];
  /** Fingerprint of the draft and the file the preview was made from; apply refuses a stale one. */
  fingerprint: string;
}

export interface ReleaseDiff {
  from: Pick<ReleaseSummary, "id" | "number" | "status">;
  to: Pick<ReleaseSummary, "id" | "number" | "status">;
  added: LineRecord[];
  removed: LineRecord[];
  changed: { before: LineRecord; after: LineRecord; fields: string[] }[];
}

export interface LineHistoryEntry {
  at: string;
  actorName: string | null;
  action: string;
  releaseNumber: number | null;
  reason: string | null;
  before: unknown;
  after: unknown;
}

/**
 * One reference line paired with one draft row, as a reference check's preview shows it: the
 * comparison's pairing (its medium is the reference line's) with the row and the reference named.
 */
export interface ReferenceCheckPair extends Omit<
  ReferencePairing,
  "referenceIndex" | "draftUncertaintyStated"
> {
  lineKey: string;
  species: string;
  draftUncertaintyNm: number | null;
  referenceUncertaintyNm: number;
  citation: string;
  /** 1-based line of the reference file. */
  csvLine: number;
  verified: boolean;
  verifiedCitation: string | null;
}

/** What a reference check would do to the draft. Writes nothing. */
export interface ReferenceCheckPreview {
  releaseId: string;
  /** SHA-256 of the reference file's text (UTF-8). */
  fileSha256: string;
  /** Fingerprint of the file, the medium and the draft's rows; apply refuses a stale one. */
  fingerprint: string;
  referenceLineCount: number;
  /** Agree and are not verified yet: marked verified on apply. */
  agreeing: ReferenceCheckPair[];
  /** Agree and are verified already: left as they are. */
  alreadyVerified: ReferenceCheckPair[];
  /** Disagree: each waits for a decision (keep ours, take the reference value, or leave). */
  disagreeing: ReferenceCheckPair[];
  /** Reference lines with no draft row of their species within the pairing window. */
  referenceOnly: {
    csvLine: number;
    species: string;
    medium: WavelengthMedium;
    wavelengthNm: number;
    uncertaintyNm: number;
    citation: string;
  }[];
  /** Draft rows of the species the file covers that no reference line paired with. */
  draftOnly: {
    lineId: string;
    lineKey: string;
    species: string;
    airNm: number | null;
    vacuumNm: number;
    uncertaintyNm: number | null;
    verified: boolean;
  }[];
  /** Live draft rows of species the file does not mention. */
  otherSpeciesCount: number;
  /** Retired draft rows, not compared. */
  retiredCount: number;
  /** The distinct citations of the reference lines that agree or could be taken. */
  citations: string[];
  /** Agreement is |Δ| ≤ coverageFactor · combined uncertainty, and never less than minToleranceNm. */
  coverageFactor: number;
  minToleranceNm: number;
  pairingWindowNm: number;
}

export type ReferenceDecision = "take" | "keep";

export interface ReferenceCheckResult {
  releaseId: string;
  /** Rows marked verified (agreeing rows and rows that took the reference value). */
  verified: number;
  /** Rows whose wavelength and uncertainty were replaced by the reference's. */
  taken: number;
  /** Disagreeing rows whose values the lab lead kept (recorded, not verified). */
  kept: number;
  /** Disagreeing rows left for later. */
  left: number;
}

// A run's analysis settings as a reader sees them: each with the value used, and "(default)" when
// the chemist left it blank, so a page never says only "defaults" without saying what they were.
import { SAMPLE_ANALYSIS_DEFAULTS } from "@/lib/spectrum/analysis/sample-analysis-defaults";
import type { RunRecord } from "@/lib/runs/types";

export interface SettingRow {
  /** The setting's name in the run form's words, with its API field. */
  label: string;
  value: string;
  isDefault: boolean;
}

/** The run form's placeholders: what a blank field means. */
export const SETTING_PLACEHOLDERS = {
  minSnr: `${SAMPLE_ANALYSIS_DEFAULTS.minSnr} (default)`,
  k: `${SAMPLE_ANALYSIS_DEFAULTS.k} (default)`,
  temperatureK: "none: the table's intensities (default)",
} as const;

export function analysisSettingRows(settings: RunRecord["settings"]): SettingRow[] {
  const row = (label: string, given: number | undefined, fallback: string, unit = "") => ({
    label,
    value: given === undefined ? `${fallback} (default)` : `${given}${unit}`,
    isDefault: given === undefined,
  });
  return [
    row(
      "Detection threshold (min SNR, minSnr)",
      settings.minSnr,
      String(SAMPLE_ANALYSIS_DEFAULTS.minSnr),
    ),
    row("Match window (k·σ, k)", settings.k, String(SAMPLE_ANALYSIS_DEFAULTS.k)),
    row(
      "Temperature for intensities (temperatureK)",
      settings.temperatureK,
      "none: the table's relative intensities",
      " K",
    ),
  ];
}

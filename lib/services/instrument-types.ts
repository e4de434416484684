// The plain shape of an instrument as the instruments service returns it: what pages and the API see;
// no Sequelize instance or column name gets past the service.
import type { FirstColumnKind, WavelengthMedium } from "@/lib/spectrum/types";

export interface InstrumentRecord {
  id: string;
  teamId: string;
  name: string;
  dispersion: "prism" | "grating";
  pixels: number;
  nominalMinNm: number;
  nominalMaxNm: number;
  resolutionNm: number;
  detectorMax: number | null;
  glass: string | null;
  apexDeg: number | null;
  /** Export profile: what the first column of its files holds, for files that do not say; null: not set. */
  exportXUnit: FirstColumnKind | null;
  /** Air or vacuum, for a wavelength profile; null when not known or not a wavelength. */
  exportMedium: WavelengthMedium | null;
  /** Optimistic-locking version: send it back with an edit. */
  version: number;
  createdAt: string;
  /** The newest calibration, the default for new runs; null when the instrument has none yet. */
  latestCalibrationId: string | null;
}

// The plain shape of an uploaded spectrum as the spectra service returns it: what pages and the API see;
// no Sequelize instance or column name gets past the service.
import type { AxisUnit, WavelengthMedium } from "@/lib/spectrum/types";

export interface SpectrumRecord {
  id: string;
  teamId: string;
  instrumentId: string;
  kind: "lamp" | "sample";
  label: string;
  fileName: string;
  byteSize: number;
  sha256: string;
  points: number;
  xUnit: AxisUnit;
  medium: WavelengthMedium | null;
  /** First and last x value, in the file's order. */
  xRange: [number, number];
  uploadedAt: string;
  uploadedById: string | null;
  /** An earlier upload of the same bytes in the team (the oldest), when there is one. */
  duplicateOf: { id: string; fileName: string; uploadedAt: string } | null;
}

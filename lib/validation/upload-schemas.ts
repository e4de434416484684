// Schemas of a spectrum upload: its size limits and the fields sent with the file. The preview and
// store routes parse with these; the services check what depends on stored data.
import { z } from "zod";
import { text } from "./text";
import { FIRST_COLUMN_KINDS, WAVELENGTH_MEDIA, type FirstColumnKind } from "@/lib/spectrum/types";

/** Largest upload, in bytes (16 MiB). Bigger files get 413 before they are parsed. */
export const MAX_UPLOAD_BYTES = 16 * 1024 * 1024;
/** Largest number of points in an uploaded spectrum. */
export const MAX_UPLOAD_POINTS = 2_000_000;

/**
 * What an upload may say its first column holds: the export profile's kinds, and plain "pixel" (pixel
 * indices counted as the instrument's profile or the values tell).
 */
export const UPLOAD_X_UNITS = [...FIRST_COLUMN_KINDS, "pixel"] as const;

export const spectrumUploadFieldsSchema = z.object({
  instrumentId: z.uuid("Choose an instrument."),
  kind: z.enum(["lamp", "sample"], { error: "Say whether this is a lamp or a sample spectrum." }),
  label: text().trim().max(200, "Use at most 200 characters.").default(""),
  xUnit: z
    .enum(UPLOAD_X_UNITS as unknown as [FirstColumnKind | "pixel", ...FirstColumnKind[]], {
      error: `The xUnit, what the file's first column holds, is one of ${UPLOAD_X_UNITS.join(", ")}.`,
    })
    .optional(),
  medium: z
    .enum(WAVELENGTH_MEDIA, { error: "The medium, of a wavelength column, is air or vacuum." })
    .optional(),
});

// Reads the multipart form of an upload (file, instrumentId, kind, label, optional xUnit and medium) for both
// POST /api/spectra and POST /api/spectra/preview, with the same size limits and field messages.
import { AppError } from "@/lib/errors";
import type { ApiRouteOptions } from "@/lib/http/api-handler";
import { bodyBytes } from "@/lib/http/read-body";
import type { SpectrumUpload } from "@/lib/services/spectra";
import { parseFields } from "@/lib/validation/field-errors";
import { cleanText } from "@/lib/validation/text";
import { MAX_UPLOAD_BYTES, spectrumUploadFieldsSchema } from "@/lib/validation/upload-schemas";

/** Room for the multipart boundaries and the other fields around the file. */
const FORM_OVERHEAD_BYTES = 64 * 1024;

/** The body cap of both upload routes (apiRoute reads the body within it before anything else). */
export const UPLOAD_ROUTE_OPTIONS: ApiRouteOptions = {
  maxBodyBytes: MAX_UPLOAD_BYTES + FORM_OVERHEAD_BYTES,
  tooLargeMessage: `The upload is larger than the ${MAX_UPLOAD_BYTES / (1024 * 1024)} MB a spectrum file may have.`,
};

export async function readUploadForm(request: Request): Promise<SpectrumUpload> {
  const bytes = await bodyBytes(request);
  let form: FormData;
  try {
    const type = request.headers.get("content-type") ?? "";
    form = await new Response(bytes as Uint8Array<ArrayBuffer>, {
      headers: { "content-type": type },
    }).formData();
  } catch {
    throw new AppError("validation", "Send the file as multipart/form-data with a `file` field.");
  }
  const file = form.get("file");
  if (!(file instanceof File)) {
    throw new AppError("validation", "Choose a file to upload.", {
      fieldErrors: { file: ["Choose a file to upload."] },
    });
  }
  if (file.size > MAX_UPLOAD_BYTES) {
    throw new AppError(
      "too_large",
      `The file is ${file.size} bytes; files of up to ${MAX_UPLOAD_BYTES} bytes (16 MiB) are accepted.`,
    );
  }
  const text = (name: string) => {
    const value = form.get(name);
    return typeof value === "string" && value !== "" ? value : undefined;
  };
  const fields = parseFields(spectrumUploadFieldsSchema, {
    instrumentId: text("instrumentId"),
    kind: text("kind"),
    label: text("label"),
    xUnit: text("xUnit"),
    medium: text("medium"),
  });
  return {
    ...fields,
    fileName: cleanText(file.name).slice(0, 255) || "upload",
    bytes: new Uint8Array(await file.arrayBuffer()),
  };
}

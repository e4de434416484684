// GET lists the team's spectra, newest first (?teamId=&instrumentId=&kind=; records without bytes or points).
// POST uploads a spectrum file (multipart: file, instrumentId, kind, label, optional xUnit). A route
// handler, not a server action, and outside the proxy's matcher, so no body cap applies but ours.
import { AppError } from "@/lib/errors";
import { apiRoute, requireActor } from "@/lib/http/api-handler";
import { fetchSpectra, uploadSpectrum } from "@/lib/services/spectra";
import { zodFieldErrors } from "@/lib/validation/field-errors";
import { parseQuery, spectraQuerySchema } from "@/lib/validation/notebook-schemas";
import { MAX_UPLOAD_BYTES, spectrumUploadFieldsSchema, teamIdQuery } from "@/lib/validation/workflow-schemas";

/** Room for the multipart boundaries and the other fields around the file. */
const FORM_OVERHEAD_BYTES = 64 * 1024;

export const GET = apiRoute(async (request) => {
  const actor = await requireActor();
  const teamId = teamIdQuery(request, actor.memberships[0]?.teamId);
  return Response.json(await fetchSpectra(actor, teamId, parseQuery(request, spectraQuerySchema)));
});

export const POST = apiRoute(async (request) => {
  const actor = await requireActor();
  const length = Number(request.headers.get("content-length") ?? "0");
  if (length > MAX_UPLOAD_BYTES + FORM_OVERHEAD_BYTES) {
    throw new AppError("too_large", `The upload is ${length} bytes; files of up to ${MAX_UPLOAD_BYTES} bytes (16 MiB) are accepted.`);
  }
  let form: FormData;
  try {
    form = await request.formData();
  } catch {
    throw new AppError("validation", "Send the file as multipart/form-data with a `file` field.");
  }
  const file = form.get("file");
  if (!(file instanceof File)) {
    throw new AppError("validation", "Choose a file to upload.", { fieldErrors: { file: ["Choose a file to upload."] } });
  }
  if (file.size > MAX_UPLOAD_BYTES) {
    throw new AppError("too_large", `The file is ${file.size} bytes; files of up to ${MAX_UPLOAD_BYTES} bytes (16 MiB) are accepted.`);
  }
  const text = (name: string) => {
    const value = form.get(name);
    return typeof value === "string" && value !== "" ? value : undefined;
  };
  const fields = spectrumUploadFieldsSchema.safeParse({
    instrumentId: text("instrumentId"),
    kind: text("kind"),
    label: text("label"),
    xUnit: text("xUnit"),
  });
  if (!fields.success) {
    throw new AppError("validation", "Some fields are not right.", { fieldErrors: zodFieldErrors(fields.error) });
  }
  const record = await uploadSpectrum(actor, {
    ...fields.data,
    fileName: file.name || "upload",
    bytes: new Uint8Array(await file.arrayBuffer()),
  });
  return Response.json(record, { status: 201 });
});

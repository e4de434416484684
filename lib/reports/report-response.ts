// The HTTP response for a report download: an attachment that no cache keeps (the data is the team's own).
/** A file to send: its name, media type and content. */
export interface ReportFile {
  fileName: string;
  contentType: string;
  body: Buffer | string;
}

export function reportResponse(file: ReportFile): Response {
  const body = typeof file.body === "string" ? file.body : new Uint8Array(file.body);
  return new Response(body, {
    headers: {
      "content-type": file.contentType,
      "content-disposition": `attachment; filename="${file.fileName}"`,
      "cache-control": "private, no-store",
      "x-content-type-options": "nosniff",
    },
  });
}

// Signed runs' PDF reports, kept in run_report_pdfs (0008-report-cache.ts) under the content hash their
// signature covers: a signed run cannot change, so its report is rendered once and then served as kept.
import "server-only";
import { QueryTypes } from "sequelize";
import { sequelize } from "@/models";

/** The kept PDF of a signed run, or null when none is kept (yet) for its signature's content hash. */
export async function keptReportPdf(runId: string): Promise<Buffer | null> {
  const [row] = await sequelize.query<{ pdf: Buffer }>(
    `SELECT p.pdf FROM run_report_pdfs p
       JOIN run_signatures s ON s.run_id = p.run_id AND s.content_hash = p.content_hash
      WHERE p.run_id = $1`,
    { bind: [runId], type: QueryTypes.SELECT },
  );
  return row ? row.pdf : null;
}

/** Keeps a signed run's PDF; a second copy (two first requests at once, two app instances) is ignored. */
export async function keepReportPdf(
  runId: string,
  contentHash: string,
  pdf: Buffer,
): Promise<void> {
  await sequelize.query(
    `INSERT INTO run_report_pdfs (run_id, content_hash, pdf, byte_size) VALUES ($1, $2, $3, $4)
     ON CONFLICT (run_id, content_hash) DO NOTHING`,
    { bind: [runId, contentHash, pdf, pdf.length] },
  );
}

// The query of GET /api/audit/verify: the team whose chain to recompute.
import { z } from "zod";

export const auditVerifyQuerySchema = z.object({ teamId: z.uuid("Choose a team.") });

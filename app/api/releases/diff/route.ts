// GET compares two releases of one team by line key: added, removed, changed (with the fields).
import { requireActor } from "@/lib/auth/session";
import { apiRoute } from "@/lib/http/api-handler";
import { AppError } from "@/lib/errors";
import { fetchRelease } from "@/lib/services/line-library-reads";
import { diffReleases } from "@/lib/services/line-library-releases";
import { diffQuerySchema } from "@/lib/validation/line-schemas";
import { zodFieldErrors } from "@/lib/validation/field-errors";

export const GET = apiRoute(async (request) => {
  const actor = await requireActor();
  const parsed = diffQuerySchema.safeParse(Object.fromEntries(new URL(request.url).searchParams));
  if (!parsed.success) {
    throw new AppError("validation", "Name two releases.", {
      fieldErrors: zodFieldErrors(parsed.error),
    });
  }
  const { from, to } = parsed.data;
  const teamId = parsed.data.teamId ?? (await fetchRelease(actor, from)).teamId;
  return Response.json(await diffReleases(actor, { teamId, fromId: from, toId: to }));
});

// GET the app's readiness, without sign-in: 200 when the database answers, 503 with Retry-After when
// it does not (for a load balancer, `npm start`'s watcher and the error page). No secrets in it.
import { DATABASE_RETRY_AFTER_SECONDS } from "@/lib/errors";
import { apiRoute } from "@/lib/http/api-handler";
import { checkHealth } from "@/lib/services/health";

export const dynamic = "force-dynamic";

export const GET = apiRoute(async () => {
  const report = await checkHealth();
  if (report.status === "ok") return Response.json(report);
  return Response.json(report, {
    status: 503,
    headers: { "Retry-After": String(DATABASE_RETRY_AFTER_SECONDS) },
  });
});

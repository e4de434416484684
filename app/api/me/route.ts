// GET the signed-in person and their teams with the role in each.
import { requireActor } from "@/lib/auth/session";
import { apiRoute } from "@/lib/http/api-handler";
import { toMe } from "./to-me";

export const GET = apiRoute(async () => Response.json(toMe(await requireActor())));

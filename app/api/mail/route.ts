// GET the messages the local fake SMTP server received (lab leads; anyone in development).
import { requireActor } from "@/lib/auth/session";
import { apiRoute } from "@/lib/http/api-handler";
import { fetchMailbox } from "@/lib/services/mailbox";

export const GET = apiRoute(async () => Response.json(await fetchMailbox(await requireActor())));

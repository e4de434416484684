// GET the messages the local fake SMTP server received (lab leads; anyone in development).
import { apiRoute, requireActor } from "@/lib/http/api-handler";
import { fetchMailbox } from "@/lib/services/mailbox";

export const GET = apiRoute(async () => Response.json(await fetchMailbox(await requireActor())));

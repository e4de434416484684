// The team a list route answers for, from its query string (the instruments, spectra and notebooks lists).
import { z } from "zod";
import { AppError } from "@/lib/errors";

/** A team id from the query string: absent means the actor's first team; malformed means not found. */
export function teamIdQuery(request: Request, fallback: string | undefined): string {
  const given = new URL(request.url).searchParams.get("teamId");
  if (given !== null && !z.uuid().safeParse(given).success)
    throw new AppError("not_found", "No such team.");
  const teamId = given ?? fallback;
  if (!teamId) throw new AppError("not_found", "You are not in a team yet.");
  return teamId;
}

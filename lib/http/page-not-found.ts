// A page's not-found, the pages' counterpart of the route handlers' error mapping: a service's
// not-found and a malformed id from the URL both become the page's not-found.
import "server-only";
import { notFound } from "next/navigation";
import { AppError } from "@/lib/errors";
import { isRecordId } from "@/lib/validation/record-id";

export async function orNotFound<T>(promise: Promise<T>): Promise<T> {
  try {
    return await promise;
  } catch (error) {
    if (error instanceof AppError && error.code === "not_found") notFound();
    throw error;
  }
}

/** A record id from the URL; a malformed one is simply not found. */
export function idOrNotFound(value: string | undefined): string {
  if (!isRecordId(value)) notFound();
  return value;
}

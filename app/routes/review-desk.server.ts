import { notFound } from "~/utils/errors";

/** Shared by the review desk's pages and API routes. */

/** A revision id from the path: digits only, else the revision simply does not exist. */
export function revisionIdParam(raw: string | undefined): number {
  const id = /^\d{1,12}$/.test(raw ?? "") ? Number(raw) : Number.NaN;
  if (!Number.isSafeInteger(id) || id <= 0) throw notFound("This revision");
  return id;
}

/** The largest decision body: a note or comment of 2,000 characters, with room for JSON escapes. */
export const REVIEW_JSON_MAX_BYTES = 16 * 1024;

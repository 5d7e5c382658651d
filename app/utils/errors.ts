/** An error a user can act on; the API and the pages turn it into the status and message below. */
export class AppError extends Error {
  constructor(
    readonly status: 400 | 401 | 403 | 404 | 409 | 413 | 415 | 422 | 429,
    readonly code: string,
    message: string,
    readonly fields?: Record<string, string>,
    readonly extra?: Record<string, unknown>,
  ) {
    super(message);
  }
}

export const notFound = (what = "This page") => new AppError(404, "not-found", `${what} does not exist or is not public.`);
export const forbidden = (message = "You are not allowed to do that.") => new AppError(403, "forbidden", message);
export const unauthorized = () => new AppError(401, "unauthorized", "Sign in to continue.");

/** Maps the database's trigger messages to the conflict the user caused. */
export function fromDbError(error: unknown): AppError | null {
  const text = String((error as { message?: string })?.message ?? error);
  if (text.includes("stale-version")) {
    return new AppError(409, "stale-version", "Someone saved this draft after you opened it. Reload to see their changes.");
  }
  if (text.includes("revision-frozen")) {
    return new AppError(409, "wrong-state", "This revision has been submitted and can no longer change.");
  }
  return null;
}

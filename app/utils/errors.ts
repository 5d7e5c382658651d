/** The statuses a user can cause; anything else is the server's fault and stays a 500. */
export type ErrorStatus = 400 | 401 | 403 | 404 | 405 | 409 | 410 | 413 | 415 | 422 | 429;

/**
 * The one error the models and services throw for something a user can act on. Routes turn it
 * into the API's `{ error: { code, message, fields } }` (utils/http.server.ts) or into a thrown
 * response that the page's ErrorBoundary shows in plain words.
 */
export class AppError extends Error {
  constructor(
    readonly status: ErrorStatus,
    readonly code: string,
    message: string,
    readonly fields?: Record<string, string>,
    readonly extra?: Record<string, unknown>,
  ) {
    super(message);
    this.name = "AppError";
  }
}

export const notFound = (what = "This page") => new AppError(404, "not-found", `${what} does not exist or is not public.`);
export const forbidden = (message = "Your account does not have access to this.") => new AppError(403, "forbidden", message);
export const unauthorized = () => new AppError(401, "unauthorized", "Sign in to continue.");
export const invalid = (fields: Record<string, string>, message = "Some fields need attention.") =>
  new AppError(400, "invalid", message, fields);
export const tooLarge = (message: string) => new AppError(413, "too-large", message);
export const unsupportedType = (message: string) => new AppError(415, "unsupported-media-type", message);

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

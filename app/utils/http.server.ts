import { data } from "react-router";
import { AppError } from "./errors";

/** The JSON API's error shape: `{ error: { code, message, fields } }` with the matching status. */
export function apiError(
  status: number,
  code: string,
  message: string,
  fields?: Record<string, string>,
  extra?: Record<string, unknown>,
) {
  return Response.json({ error: { code, message, ...(fields ? { fields } : {}), ...extra } }, { status });
}

/** Runs an API handler and turns an AppError into its JSON answer. */
export async function handleApi(fn: () => Promise<Response>): Promise<Response> {
  try {
    return await fn();
  } catch (error) {
    if (error instanceof AppError) return apiError(error.status, error.code, error.message, error.fields, error.extra);
    if (error instanceof Response) return error;
    throw error;
  }
}

/** For page loaders: a thrown 404 that the route's ErrorBoundary explains. */
export function pageNotFound(message = "Not found") {
  return data(message, { status: 404 });
}

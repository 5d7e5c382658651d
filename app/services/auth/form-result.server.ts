import { data } from "react-router";
import type { FormFailure } from "~/components/auth-form";
import { AppError } from "~/utils/errors";
import { keepTyped } from "./fields.server";

/**
 * Turns a refusal into the form's answer: the status, the message, the field errors and the values
 * to type back into the form (never a password). A 429 also says when to retry.
 */
export function formFailure(error: AppError, values: Record<string, string>) {
  const retryAfter = error.extra?.retryAfter;
  const body: FormFailure = {
    ok: false,
    code: error.code,
    message: error.message,
    fields: error.fields,
    values: keepTyped(values),
  };
  return data(body, { status: error.status, headers: retryAfter ? { "Retry-After": String(retryAfter) } : undefined });
}

/** Runs an account action; a refusal becomes the form's answer, anything else stays an error. */
export async function runForm<T>(values: Record<string, string>, fn: () => Promise<T>) {
  try {
    return await fn();
  } catch (error) {
    if (error instanceof AppError) return formFailure(error, values);
    throw error;
  }
}

/**
 * Route `headers` export for the account forms: React Router drops an action's headers from the
 * page response unless the route passes them on, and a 429 must say when to come back.
 */
export function formHeaders({ actionHeaders }: { actionHeaders: Headers }) {
  const retryAfter = actionHeaders.get("Retry-After");
  return retryAfter ? { "Retry-After": retryAfter } : new Headers();
}

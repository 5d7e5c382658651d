import { AppError } from "./errors";

/** The AppError a call refused with; fails when it went through or failed some other way. */
export async function refusal(promise: Promise<unknown>): Promise<AppError> {
  try {
    await promise;
  } catch (error) {
    if (error instanceof AppError) return error;
    throw error;
  }
  throw new Error("expected a refusal");
}

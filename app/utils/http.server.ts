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

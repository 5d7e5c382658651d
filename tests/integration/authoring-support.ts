import { type TestClient, signedIn } from "../support/http-client";

export { signedIn };

/** Calls to the authoring API the way the editor makes them: JSON in, JSON out, our Origin on writes. */
export type Answer<T = Record<string, unknown>> = { status: number; body: T };

export async function sendJson<T = Record<string, unknown>>(
  client: TestClient,
  method: "GET" | "POST" | "PUT",
  path: string,
  body?: unknown,
): Promise<Answer<T>> {
  const response = await client.request(path, {
    method,
    ...(body === undefined ? {} : { headers: { "content-type": "application/json" }, body: JSON.stringify(body) }),
  });
  const text = await response.text();
  let parsed: unknown = text;
  try {
    parsed = JSON.parse(text);
  } catch {
    // not JSON: keep the text for the assertion message
  }
  return { status: response.status, body: parsed as T };
}

export type ApiError = {
  error: { code: string; message: string; fields?: Record<string, string>; missing?: string[]; current?: unknown };
};

import { checkCircuit, parseCircuitInput } from "~/engine/circuit";
import { apiError } from "~/utils/http.server";
import type { Route } from "./+types/api.circuit";

export function loader() {
  return Response.json(
    {
      error: {
        code: "method-not-allowed",
        message: "POST a circuit (JSON) to this address; see the circuit planner at /tools/circuit.",
      },
    },
    { status: 405, headers: { allow: "POST" } },
  );
}

/** The circuit check for anyone: a circuit callout in (engine §1 field names), the check out. */
export async function action({ request }: Route.ActionArgs) {
  if (request.method !== "POST") return loader();
  if (!request.headers.get("content-type")?.includes("application/json")) {
    return apiError(415, "unsupported-media-type", "Send the circuit as JSON (Content-Type: application/json).");
  }
  const text = await request.text();
  if (text.length > 16_384) return apiError(413, "too-large", "The circuit description is larger than 16 KB.");
  let body: unknown;
  try {
    body = JSON.parse(text);
  } catch {
    return apiError(400, "invalid-json", "The body is not valid JSON.");
  }
  const parsed = parseCircuitInput(body);
  if (!parsed.ok) return apiError(400, "invalid", "Some fields need attention.", parsed.fields);
  return Response.json(checkCircuit(parsed.value));
}

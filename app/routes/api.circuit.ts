import { checkCircuit, circuitInputSchema } from "~/engine/circuit";
import { AppError } from "~/utils/errors";
import { apiHandler, errorResponse, readJson } from "~/utils/http.server";
import type { Route } from "./+types/api.circuit";

const notAllowed = () =>
  new AppError(405, "method-not-allowed", "POST a circuit (JSON) to this address; see the circuit planner at /tools/circuit.");

export function loader() {
  const response = errorResponse(notAllowed());
  response.headers.set("Allow", "POST");
  return response;
}

/** The circuit check for anyone: a circuit callout in (engine §1 field names), the check out. */
export const action = apiHandler(async ({ request }: Route.ActionArgs) => {
  if (request.method !== "POST") return loader();
  const input = await readJson(request, circuitInputSchema, { maxBytes: 16_384 });
  return Response.json(checkCircuit(input));
});

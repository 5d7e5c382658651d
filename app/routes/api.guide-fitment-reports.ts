import { getDb } from "~/db/client.server";
import { reportInputSchema, submitFitmentReport } from "~/models/fitment-reports.server";
import { apiHandler, readJson } from "~/utils/http.server";
import type { Route } from "./+types/api.guide-fitment-reports";
import { apiUser, methodNotAllowed, PRIVATE_JSON } from "./authoring-api.server";

/** A report is an id or two, an outcome and a note of at most 500 characters. */
const REPORT_JSON_MAX_BYTES = 8 * 1024;

export function loader() {
  return methodNotAllowed(["POST"], "Fitment reports");
}

/**
 * A signed-in reader reports how the guide fitted one of their vehicles:
 * `{ vehicleId?, variantId?, outcome, note }` → 201 (api.md). A second report for the same variant
 * replaces the first.
 */
export const action = apiHandler(async (args: Route.ActionArgs) => {
  if (args.request.method !== "POST") return loader();
  const user = await apiUser(args);
  const input = await readJson(args.request, reportInputSchema, { maxBytes: REPORT_JSON_MAX_BYTES });
  const report = await submitFitmentReport(await getDb(), user, args.params.slug, input);
  return Response.json({ report }, { status: 201, headers: PRIVATE_JSON });
});

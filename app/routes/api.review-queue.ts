import { getDb } from "~/db/client.server";
import { reviewQueueView } from "~/models/review-desk.server";
import { reviewQueueQuerySchema } from "~/models/review-input";
import { requirePermission } from "~/services/auth/guards.server";
import { apiHandler } from "~/utils/http.server";
import type { Route } from "./+types/api.review-queue";
import { methodNotAllowed, PRIVATE_JSON } from "./authoring-api.server";

/** Revisions waiting for review, oldest first (`?vehicle=make.model&blocking=1` to narrow it). Editors only. */
export const loader = apiHandler(async (args: Route.LoaderArgs) => {
  const user = await requirePermission(args, "review:revision:any");
  const params = new URL(args.request.url).searchParams;
  const query = reviewQueueQuerySchema.parse({
    vehicle: params.get("vehicle") ?? undefined,
    blocking: params.get("blocking") ?? undefined,
  });
  return Response.json(await reviewQueueView(await getDb(), user, query), { headers: PRIVATE_JSON });
});

export function action() {
  return methodNotAllowed(["GET"], "The review queue");
}

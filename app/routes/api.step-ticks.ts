import { getDb } from "~/db/client.server";
import { readStepTicks, setStepTick } from "~/models/step-ticks.server";
import { apiHandler, readJson } from "~/utils/http.server";
import { AppError } from "~/utils/errors";
import { stepTickInputSchema, TICK_READER_HEADER } from "~/utils/step-ticks";
import type { Route } from "./+types/api.step-ticks";
import { apiUser, methodNotAllowed, PRIVATE_JSON } from "./authoring-api.server";

/** A tick is three small fields; anything larger is not one. */
const TICK_MAX_BYTES = 1024;

/**
 * The signed-in reader's "step done" ticks on a published guide: only ever their own (the session
 * picks the reader, no path or body can name another). Private: never kept by a shared cache, so
 * the guide page itself stays the same for everyone and fetches these beside it.
 */
export const loader = apiHandler(async (args: Route.LoaderArgs) => {
  const user = await apiUser(args);
  return Response.json(await readStepTicks(await getDb(), user.id, args.params.slug), { headers: PRIVATE_JSON });
});

/**
 * PUT `{ revision, position, done }`: sets or clears one tick and answers all of the reader's ticks.
 * With X-Torqueleaf-Reader (the pages send it), 409 unless it names the signed-in reader.
 */
export const action = apiHandler(async (args: Route.ActionArgs) => {
  if (args.request.method !== "PUT") return methodNotAllowed(["GET", "PUT"], "A guide's step ticks");
  const user = await apiUser(args);
  const madeFor = args.request.headers.get(TICK_READER_HEADER);
  if (madeFor !== null && madeFor !== String(user.id)) {
    throw new AppError(409, "other-reader", "This tick was made by another reader on this device; it was not saved.");
  }
  const input = await readJson(args.request, stepTickInputSchema, { maxBytes: TICK_MAX_BYTES });
  return Response.json(await setStepTick(await getDb(), user.id, args.params.slug, input), { headers: PRIVATE_JSON });
});

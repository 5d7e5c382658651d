import { getDb } from "~/db/client.server";
import { deleteVehicle, listVehicles, vehicleIdField, vehiclesJson } from "~/models/vehicles.server";
import { notFound } from "~/utils/errors";
import { apiHandler } from "~/utils/http.server";
import type { Route } from "./+types/api.me-vehicle";
import { apiUser, methodNotAllowed, PRIVATE_JSON } from "./authoring-api.server";

export function loader() {
  return methodNotAllowed(["DELETE"], "A saved vehicle");
}

/** Deletes one of the reader's vehicles (404 for none, 403 for another reader's) → the remaining list. */
export const action = apiHandler(async (args: Route.ActionArgs) => {
  if (args.request.method !== "DELETE") return loader();
  const user = await apiUser(args);
  const id = vehicleIdField.safeParse(args.params.id);
  if (!id.success) throw notFound("That saved vehicle");
  const db = await getDb();
  await deleteVehicle(db, user, id.data);
  return Response.json(vehiclesJson(await listVehicles(db, user.id)), { headers: PRIVATE_JSON });
});

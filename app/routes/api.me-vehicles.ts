import { getDb } from "~/db/client.server";
import { listVehicles, saveVehicle, vehicleInputSchema, vehiclesJson } from "~/models/vehicles.server";
import { apiHandler, readJson } from "~/utils/http.server";
import type { Route } from "./+types/api.me-vehicles";
import { apiUser, methodNotAllowed, PRIVATE_JSON } from "./authoring-api.server";

/** A vehicle is three small fields; 4 KB is room enough. */
const VEHICLE_JSON_MAX_BYTES = 4 * 1024;

/** The signed-in reader's saved vehicles (api.md): `{ vehicles: [{ id, variantId, year, nickname, current }] }`. */
export const loader = apiHandler(async (args: Route.LoaderArgs) => {
  const user = await apiUser(args);
  return Response.json(vehiclesJson(await listVehicles(await getDb(), user.id)), { headers: PRIVATE_JSON });
});

/** Saves a vehicle `{ variantId, year, nickname, current? }` → 201 with the new id and the whole list. */
export const action = apiHandler(async (args: Route.ActionArgs) => {
  if (args.request.method !== "POST") return methodNotAllowed(["GET", "POST"], "The list of your vehicles");
  const user = await apiUser(args);
  const input = await readJson(args.request, vehicleInputSchema, { maxBytes: VEHICLE_JSON_MAX_BYTES });
  const db = await getDb();
  const { id } = await saveVehicle(db, user, input);
  return Response.json({ id, ...vehiclesJson(await listVehicles(db, user.id)) }, { status: 201, headers: PRIVATE_JSON });
});

import { redirect } from "react-router";
import { z } from "zod";
import { getDb } from "~/db/client.server";
import { PICKER_PARAMS } from "~/models/vehicle-picker.server";
import {
  checkPick,
  findSameVehicle,
  makeCurrent,
  saveVehicle,
  variantIdField,
  vehicleInputSchema,
} from "~/models/vehicles.server";
import { safeRedirect } from "~/services/auth/redirect";
import { getUser } from "~/services/auth/session.server";
import { clearedVehicleCookieHeader, vehicleCookieHeader } from "~/services/vehicle-cookie.server";
import { AppError } from "~/utils/errors";
import { parseValues, readForm, redirectWithFlash } from "~/utils/forms.server";
import type { Route } from "./+types/pick-vehicle";

const pickSchema = z.discriminatedUnion(
  "intent",
  [
    z.object({
      intent: z.literal("pick"),
      variantId: variantIdField,
      year: vehicleInputSchema.shape.year,
      nickname: vehicleInputSchema.shape.nickname,
    }),
    z.object({ intent: z.literal("forget") }),
  ],
  { error: "Choose a vehicle, or forget the one picked." },
);

/** The page to go back to, without the picker's steps in its address. */
function backTo(value: string | undefined): string {
  const path = safeRedirect(value, "/");
  const url = new URL(path, "http://x");
  for (const name of PICKER_PARAMS) url.searchParams.delete(name);
  return `${url.pathname}${url.search}${url.hash}`;
}

export function loader() {
  return redirect("/me/vehicles");
}

/**
 * The vehicle picker's target. A signed-in reader's pick is saved (or, when they keep it already,
 * made current); a visitor's is kept in a signed cookie. Either way the pages then judge fitment
 * against it. Goes back to `returnTo` with a message, also when a field is wrong.
 */
export async function action(args: Route.ActionArgs) {
  const values = await readForm(args.request);
  const to = backTo(values.returnTo);
  const db = await getDb();
  try {
    const input = parseValues(pickSchema, values);
    const user = await getUser(args);
    if (input.intent === "forget") {
      return redirectWithFlash(
        to,
        { tone: "info", text: "The picked vehicle is forgotten on this device." },
        { headers: { "Set-Cookie": await clearedVehicleCookieHeader() } },
      );
    }
    if (user) {
      const same = await findSameVehicle(db, user.id, input.variantId, input.year);
      if (same) await makeCurrent(db, user, same.id);
      else await saveVehicle(db, user, { ...input, current: true });
      return redirectWithFlash(to, { tone: "success", text: "Saved to My vehicles as your current vehicle." });
    }
    await checkPick(db, input.variantId, input.year);
    const headers = { "Set-Cookie": await vehicleCookieHeader({ variantId: input.variantId, year: input.year }) };
    return redirectWithFlash(to, { tone: "success", text: "Vehicle picked. Sign in to keep it in My vehicles." }, { headers });
  } catch (error) {
    if (!(error instanceof AppError)) throw error;
    // Back to the same step of the picker, so nothing chosen is lost.
    const why = Object.values(error.fields ?? {}).join(" ") || error.message;
    return redirectWithFlash(safeRedirect(values.returnTo, "/"), { tone: "error", text: why.slice(0, 400) });
  }
}

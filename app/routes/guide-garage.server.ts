import type { Db } from "~/db/client.server";
import type { ContentStamps } from "~/models/content-stamps.server";
import { ownReports, publicReports } from "~/models/fitment-reports.server";
import { PICKER_PARAMS, pickerOptions } from "~/models/vehicle-picker.server";
import { currentVehicle, findSameVehicle, listVehicles, pickedVehicle } from "~/models/vehicles.server";
import { getUser } from "~/services/auth/session.server";
import { can } from "~/utils/permissions";

/**
 * What the guide page shows about the reader's vehicles: the current vehicle (or the picker), the
 * readers' fitment reports and their tally per variant, and for a signed-in reader their vehicles and
 * own reports for the report form. The readers' reports are kept by the reports stamp read for this
 * request (`stamps`): a new report raises it, so it shows at once, and the page's data (the document
 * cache's key) changes with it; the reader's own vehicles and reports are read per request.
 */
export async function guideGarage(args: { request: Request; context?: unknown }, db: Db, guideId: number, stamps: ContentStamps) {
  const url = new URL(args.request.url);
  const [user, vehicle, { tallies, reports }] = await Promise.all([
    getUser(args),
    currentVehicle(args, db),
    publicReports(db, guideId, stamps),
  ]);
  const picking = url.searchParams.has("pick") || PICKER_PARAMS.some((p) => url.searchParams.has(p));
  const picker = !vehicle || picking ? await pickerOptions(db, url.searchParams, stamps) : null;
  const mine = user
    ? await Promise.all([listVehicles(db, user.id), ownReports(db, user.id, guideId), pickedVehicle(args.request, db)])
    : null;
  // A vehicle picked before signing in, not saved yet: the page offers to save it.
  const picked = mine?.[2];
  const offer =
    user && picked?.year && !(await findSameVehicle(db, user.id, picked.variantId, picked.year))
      ? { variantId: picked.variantId, year: picked.year, label: picked.label }
      : null;
  return {
    signedIn: !!user,
    vehicle,
    picker,
    offer,
    tallies,
    reports,
    myVehicles:
      mine?.[0].map(({ id, variantId, label, nickname, current }) => ({ id, variantId, label, nickname, current })) ?? [],
    myReports: mine?.[1] ?? [],
    canHide: can(user, "hide:fitment-report:any"),
  };
}

export type GuideGarage = Awaited<ReturnType<typeof guideGarage>>;

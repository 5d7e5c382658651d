import { z } from "zod";
import { env } from "~/utils/env.server";
import { cookieIsSecure, cookieName, signedCookie } from "./auth/cookie.server";

/** A visitor who is not signed in keeps the vehicle they picked for a year, in a signed cookie. */
const VEHICLE_COOKIE_DAYS = 365;
const BASE = "tl_vehicle";

const vehicleCookie = () => signedCookie(BASE, VEHICLE_COOKIE_DAYS * 24 * 60 * 60, env());

/** What the cookie holds: a variant and a model year, nothing that names the visitor. */
export const cookieVehicleSchema = z.object({
  variantId: z
    .number()
    .int()
    .positive()
    .max(2 ** 31),
  year: z.number().int().min(1900).max(2100),
});
export type CookieVehicle = z.infer<typeof cookieVehicleSchema>;

/**
 * Whether the request carries a picked vehicle at all (without checking its signature): pages that
 * may show it are then answered `private, no-store`, never kept by a shared cache.
 */
export function hasVehicleCookie(request: Request): boolean {
  const header = request.headers.get("cookie");
  if (!header) return false;
  const name = cookieName(BASE, cookieIsSecure(env()));
  return header.split(";").some((part) => part.trim().startsWith(`${name}=`));
}

/** The picked vehicle, or null when there is none or its signature or shape is wrong. */
export async function readVehicleCookie(request: Request): Promise<CookieVehicle | null> {
  if (!hasVehicleCookie(request)) return null;
  const parsed = cookieVehicleSchema.safeParse(await vehicleCookie().parse(request.headers.get("cookie")));
  return parsed.success ? parsed.data : null;
}

export async function vehicleCookieHeader(vehicle: CookieVehicle): Promise<string> {
  return vehicleCookie().serialize(vehicle);
}

export async function clearedVehicleCookieHeader(): Promise<string> {
  return vehicleCookie().serialize("", { maxAge: 0 });
}

/**
 * A typical one-way wire run from the 12 V battery to an accessory, from where the vehicle keeps
 * its battery and where the accessory goes. These are planning defaults (common practice: routing
 * follows the body, not a straight line), to be replaced by a measured length.
 */
export const ACCESSORY_PLACES = ["front", "dash", "rear"] as const;
export type AccessoryPlace = (typeof ACCESSORY_PLACES)[number];

export const ACCESSORY_PLACE_LABELS: Record<AccessoryPlace, string> = {
  front: "Front: bumper, grille or hood",
  dash: "Cabin, at the dashboard",
  rear: "Rear: cargo area or tailgate",
};

type BatteryLocation = "engine-bay" | "cargo-area" | "under-seat";

/** Extra run beyond the battery-to-firewall length, metres (common practice, rounded). */
const FROM_FIREWALL_M: Record<AccessoryPlace, number> = { front: 1.5, dash: 0.8, rear: 3.5 };

export function typicalRunLengthM(variant: { batteryLocation: BatteryLocation; batteryRunM: number }, place: AccessoryPlace) {
  const toFirewall = variant.batteryRunM;
  let metres: number;
  if (variant.batteryLocation === "engine-bay") {
    // The battery sits beside front accessories; cabin and rear loads pass the firewall first.
    metres = place === "front" ? 1.5 : toFirewall + FROM_FIREWALL_M[place];
  } else if (place === "rear" && variant.batteryLocation === "cargo-area") {
    metres = 1.2;
  } else if (place === "rear") {
    metres = 2;
  } else {
    // A battery behind the cabin feeds the dash and the front through the whole length of the body.
    metres = toFirewall + (place === "front" ? FROM_FIREWALL_M.front : 0);
  }
  return Math.round(metres * 10) / 10;
}

/**
 * Where a torque value comes from. Kept free of imports: the database schema reads it too.
 * An estimate is always labelled one (engine §2).
 */
export const TORQUE_SOURCES = ["vehicle-maker", "accessory-maker", "author-measured", "estimate"] as const;
export type TorqueSource = (typeof TORQUE_SOURCES)[number];

export const TORQUE_SOURCE_LABELS: Record<TorqueSource, string> = {
  "vehicle-maker": "the vehicle maker's service manual",
  "accessory-maker": "the accessory maker's fitting instructions",
  "author-measured": "measured by the guide's author",
  estimate: "an estimate from the bolt size and class (no maker's value)",
};

import type { FINDING_SEVERITIES } from "../utils/vocab";
import type { SourceId } from "./sources";
import type { WireSize, AwgSize } from "./wire";

/** The same three severities the database stores with a revision's findings. */
export type Severity = (typeof FINDING_SEVERITIES)[number];

/**
 * Rule ids are part of the API: the review desk and stored findings key on them. Each with the
 * severity it is always reported at (api.md lists the same ids).
 */
export const CIRCUIT_RULES = {
  "no-fuse": "blocking",
  "fuse-exceeds-wire": "blocking",
  "no-fuse-fits": "blocking",
  "no-wire-fits": "blocking",
  "switch-overloaded": "blocking",
  "switch-feed-exceeds-wire": "blocking",
  "fuse-above-ampacity": "warning",
  "fuse-undersized": "warning",
  "drop-over-limit": "warning",
  "fuse-far-from-battery": "warning",
  "wire-unrated": "warning",
  "relay-recommended": "info",
} as const satisfies Record<string, Severity>;

export type CircuitRule = keyof typeof CIRCUIT_RULES;

export type CircuitFinding = {
  rule: CircuitRule;
  severity: Severity;
  message: string;
  source: SourceId;
  numbers: Record<string, number>;
};

export type WireCheck = {
  wire: WireSize;
  label: string;
  /** null: smaller than the thinnest gauge in the ampacity table. */
  ampacityA: number | null;
  /** The gauge whose table row gave the ampacity (itself for AWG sizes). */
  ampacityGauge: AwgSize | null;
  resistanceOhmPerM: number;
  dropV: number;
  dropPct: number;
  /** Against the recommended fuse for candidates, the chosen fuse for `chosen`; false when there is no fuse to carry. */
  carriesFuse: boolean;
  withinDrop: boolean;
};

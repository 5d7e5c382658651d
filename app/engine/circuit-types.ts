import type { FINDING_SEVERITIES } from "../utils/vocab";
import type { SourceId } from "./sources";
import type { WireSize, AwgSize } from "./wire";

/** The same three severities the database stores with a revision's findings. */
export type Severity = (typeof FINDING_SEVERITIES)[number];

/** Rule ids are part of the API: the review desk and stored findings key on them. */
export type CircuitRule =
  | "no-fuse"
  | "fuse-exceeds-wire"
  | "fuse-above-ampacity"
  | "fuse-undersized"
  | "drop-over-limit"
  | "fuse-far-from-battery"
  | "relay-recommended"
  | "wire-unrated";

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

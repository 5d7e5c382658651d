/**
 * The engine's public API. Pure computation: routes, the editor, the review
 * desk and the JSON API all call it, so it must never reach for I/O.
 */
export * from "./sources";
export * from "./circuit";
export * from "./torque";
export * from "./callouts";
export * from "./rules";
export * from "./diagram";
export * from "./chart";
export { num as formatNumber } from "./format";
export * from "./runs";

import { idParam } from "~/models/checklist-input";
import { notFound } from "~/utils/errors";

/** Shared by the checklist API routes. */

/** The largest checklist body: a note of 500 characters and its field names fit many times over. */
export const CHECKLIST_JSON_MAX_BYTES = 8 * 1024;

/** A checklist or item id from the path (digits only), else it does not exist. */
export function pathId(raw: string | undefined, what: "This checklist" | "This item"): number {
  const id = idParam(raw);
  if (id === null) throw notFound(what);
  return id;
}

import type { z } from "zod";

/** The key that stands for the whole form or body when an issue has no path. */
export const WHOLE_INPUT = "_";

/**
 * zod issues → the first message per field, keyed by the field's full dotted path
 * (`steps.2.title`): the same keys the forms use as input names and the API returns as `fields`.
 */
export function fieldErrors(error: z.ZodError): Record<string, string> {
  const fields: Record<string, string> = {};
  for (const issue of error.issues) {
    const key = issue.path.length ? issue.path.map(String).join(".") : WHOLE_INPUT;
    fields[key] ??= issue.message;
  }
  return fields;
}

/** The top-level field names a schema declares (objects, unions of objects, and wrappers around them). */
export function schemaKeys(schema: z.ZodType): string[] {
  const def = (schema as unknown as { def?: Record<string, unknown> }).def ?? {};
  const shape = (schema as unknown as { shape?: Record<string, unknown> }).shape;
  if (shape && typeof shape === "object") return Object.keys(shape);
  if (Array.isArray(def.options)) return [...new Set((def.options as z.ZodType[]).flatMap(schemaKeys))];
  if (def.left && def.right) return [...new Set([...schemaKeys(def.left as z.ZodType), ...schemaKeys(def.right as z.ZodType)])];
  for (const inner of [def.in, def.innerType, def.schema]) {
    if (inner) return schemaKeys(inner as z.ZodType);
  }
  return [];
}

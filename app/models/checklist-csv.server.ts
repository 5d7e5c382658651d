import { stringify } from "csv-stringify/sync";
import type { ChecklistView } from "./checklist-input";

export const CHECKLIST_CSV_COLUMNS = ["item", "quantity", "part number", "step", "checked", "note"] as const;

/**
 * The checklist as CSV (RFC 4180: CRLF rows, fields with commas, quotes or line breaks quoted).
 * A cell that starts with =, +, -, @, tab or carriage return is prefixed with a single quote, so a
 * spreadsheet shows it as text rather than running it as a formula (OWASP, "CSV Injection").
 */
export function checklistCsv(checklist: ChecklistView): string {
  const rows = checklist.items.map((item) => [
    item.removed ? `${item.name} (no longer in the guide)` : item.name,
    String(item.quantity),
    item.partNumber ?? "",
    item.step === null ? "" : String(item.step),
    item.checked ? "yes" : "no",
    item.note ?? "",
  ]);
  return stringify([[...CHECKLIST_CSV_COLUMNS], ...rows], { record_delimiter: "\r\n", escape_formulas: true });
}

/** The download's file name: the guide's slug (letters, digits and dashes only) and the checklist. */
export function checklistCsvName(checklist: ChecklistView): string {
  const slug = checklist.guide.slug.replace(/[^a-z0-9-]/gi, "").slice(0, 80) || "guide";
  return `checklist-${slug}-${checklist.id}.csv`;
}

/** The CSV as an attachment, for the owner only: never kept by a shared cache. */
export function checklistCsvResponse(checklist: ChecklistView): Response {
  return new Response(`\uFEFF${checklistCsv(checklist)}`, {
    headers: {
      "Content-Type": "text/csv; charset=utf-8; header=present",
      "Content-Disposition": `attachment; filename="${checklistCsvName(checklist)}"`,
      "Cache-Control": "private, no-store",
    },
  });
}

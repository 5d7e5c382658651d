/**
 * The guide's print view: no site chrome, one column. An inline style sheet, so the
 * Content-Security-Policy allows exactly this text by its hash (app/services/http/security-headers.server.ts).
 */
export const PRINT_STYLE =
  ".no-print{display:none!important}.tl-guide-grid{display:block!important}.tl-guide-grid aside{position:static;margin-top:2rem}.tl-guide-grid figure{max-width:30rem;break-inside:avoid}";

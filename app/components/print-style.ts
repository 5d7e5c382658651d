/**
 * The guide's print view (`?print=1`): no site chrome, one column, the kit before the steps, every
 * "how it was worked out" open, as the page will print. An inline style sheet, so the
 * Content-Security-Policy allows exactly this text by its hash, which
 * app/services/http/security-headers.server.ts computes from this constant at start-up: edit the
 * text here and the hash follows. The same rules for any printed guide page are in app.css.
 */
export const PRINT_STYLE =
  ".no-print{display:none!important}.tl-guide-grid{display:block!important}.tl-guide-kit{display:block;position:static;max-height:none;overflow:visible;margin-bottom:2.5rem}.tl-guide-kit>*+*{margin-top:1.5rem}.tl-guide figure{max-width:30rem;break-inside:avoid}.tl-guide details::details-content{content-visibility:visible}";

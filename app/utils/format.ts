/**
 * Formatting for the screen, the same on the server and in the browser: one explicit locale and,
 * for dates, one explicit time zone (UTC), so the HTML the server sends is exactly what the
 * browser renders when it hydrates, whatever zone the reader or the server is in. The number
 * formatters are built once per process: building an Intl formatter costs far more than using one.
 */
const LOCALE = "en-GB";

/** Dates are shown in UTC, and say so where a time of day is shown. */
export const DISPLAY_TIME_ZONE = "UTC";

/**
 * Dates are spelt out by hand rather than through Intl.DateTimeFormat: the locale data of the
 * server's Node and of the reader's browser differ between versions (en-GB's September is "Sep" in
 * some and "Sept" in others, the date and time are joined by "," or " at"), and any difference
 * breaks hydration.
 */
const MONTHS = ["Jan", "Feb", "Mar", "Apr", "May", "Jun", "Jul", "Aug", "Sep", "Oct", "Nov", "Dec"];
const twoDigits = (n: number) => String(n).padStart(2, "0");

/** One number formatter per number of decimals (0 to 6 cover every value the screens show). */
const NUMBERS = Array.from(
  { length: 7 },
  (_, digits) => new Intl.NumberFormat(LOCALE, { maximumFractionDigits: digits, minimumFractionDigits: 0 }),
);

type DateInput = Date | string | number;
const toDate = (value: DateInput) => (value instanceof Date ? value : new Date(value));

/** "2 Dec 2026": the calendar day in UTC. */
export function formatDate(value: DateInput): string {
  const date = toDate(value);
  return `${date.getUTCDate()} ${MONTHS[date.getUTCMonth()]} ${date.getUTCFullYear()}`;
}

/** "2 Dec 2026, 14:05 UTC". */
export function formatDateTime(value: DateInput): string {
  const date = toDate(value);
  return `${formatDate(date)}, ${twoDigits(date.getUTCHours())}:${twoDigits(date.getUTCMinutes())} ${DISPLAY_TIME_ZONE}`;
}

/** The machine-readable form for `<time dateTime>`: an ISO 8601 instant in UTC. */
export function isoDateTime(value: DateInput): string {
  return toDate(value).toISOString();
}

/**
 * A duration in whole minutes: under 90 minutes in minutes ("45 min"), from 90 on in hours and
 * minutes ("1 h 30 min", "2 h"). One rule for every screen that shows a guide's time.
 */
export function formatMinutes(minutes: number): string {
  const total = Math.max(0, Math.round(minutes));
  if (total < 90) return `${total} min`;
  const hours = Math.floor(total / 60);
  const rest = total % 60;
  return rest === 0 ? `${hours} h` : `${hours} h ${rest} min`;
}

/** Rounds for the screen only; the API keeps numbers unrounded. */
export function round(value: number, digits = 1): string {
  const format = NUMBERS[Math.min(Math.max(Math.trunc(digits), 0), NUMBERS.length - 1)];
  return format.format(value);
}

const NBSP = "\u00a0";
/** Units written after a number in guides and results (SI and the customary ones the trade uses). */
const UNITS = "N·m|lbf·ft|lbf·in|mm²|mm|cm|km|m|in|ft|°C|°F|%|AWG|kW|W|mA|Ah|A|kV|mV|V|Ω|kg|g|lb|min|h|s";
const NUMBER_THEN_UNIT = new RegExp(`(\\d) (?=(?:${UNITS})(?![\\p{L}\\p{N}]))`, "gu");

/** Joins each number to its unit with a no-break space, so a line never breaks between "20" and "A". */
export function keepUnitsTogether(text: string): string {
  return text.replace(NUMBER_THEN_UNIT, `$1${NBSP}`);
}

/** `keepUnitsTogether` on the text of rendered HTML, leaving the tags and their attributes alone. */
export function keepUnitsTogetherInHtml(html: string): string {
  return html
    .split(/(<[^>]*>)/)
    .map((part) => (part.startsWith("<") ? part : keepUnitsTogether(part)))
    .join("");
}

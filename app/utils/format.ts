export function formatMinutes(minutes: number) {
  if (minutes < 90) return `${minutes} min`;
  const hours = minutes / 60;
  return `${Number.isInteger(hours) ? hours : hours.toFixed(1)} h`;
}

/** Rounds for the screen only; the API keeps numbers unrounded. */
export function round(value: number, digits = 1) {
  return value.toLocaleString("en-GB", { maximumFractionDigits: digits, minimumFractionDigits: 0 });
}

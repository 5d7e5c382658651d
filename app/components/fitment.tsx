import { FITMENT_LABELS, POWERTRAIN_LABELS, type FitmentStatus, type Powertrain } from "~/utils/vocab";

export type FitmentRow = {
  variantId: number;
  make: string;
  model: string;
  generation: string;
  years?: string;
  variant?: string;
  powertrain: string;
  drivetrain: string;
  status: string;
  note?: string | null;
};

/**
 * Shape as well as colour tells the statuses apart, so the badges read in greyscale and print. A
 * variant the part does not fit says so in words beside a cross, never by striking the name
 * through, which reads as deleted text (and is lost on some screen readers and printers).
 */
const STATUS_STYLE: Record<FitmentStatus, { mark: string; className: string; words?: string }> = {
  fits: { mark: "●", className: "border-spruce-200 bg-spruce-50 text-spruce-800" },
  "fits-with-changes": { mark: "◐", className: "border-brass-100 bg-brass-50 text-brass-700" },
  "does-not-fit": { mark: "✕", className: "border-rule border-dashed bg-paper text-ink-soft", words: "does not fit" },
};

export function FitmentBadge({ row }: { row: FitmentRow }) {
  const style = STATUS_STYLE[row.status as FitmentStatus] ?? STATUS_STYLE.fits;
  const label = `${POWERTRAIN_LABELS[row.powertrain as Powertrain] ?? row.powertrain} ${row.drivetrain}`;
  return (
    <span
      className={`inline-flex items-center gap-1 whitespace-nowrap rounded-md border px-2 py-0.5 text-xs font-medium ${style.className}`}
      title={`${row.make} ${row.model} ${row.generation}${row.variant ? ` ${row.variant}` : ""}: ${FITMENT_LABELS[row.status as FitmentStatus]}${row.note ? ` (${row.note})` : ""}`}
    >
      <span aria-hidden="true">{style.mark}</span>
      {label}
      {style.words ? (
        <span className="font-normal">
          <span className="sr-only">:</span> {style.words}
        </span>
      ) : (
        <span className="sr-only">: {FITMENT_LABELS[row.status as FitmentStatus]}</span>
      )}
    </span>
  );
}

/** Fitment badges grouped by make, model and generation. */
export function FitmentSummary({ rows }: { rows: FitmentRow[] }) {
  const groups = new Map<string, FitmentRow[]>();
  for (const row of rows) {
    const key = `${row.make} ${row.model} ${row.generation}${row.years ? ` (${row.years})` : ""}`;
    groups.set(key, [...(groups.get(key) ?? []), row]);
  }
  return (
    <dl className="mt-3 space-y-1.5">
      {[...groups].map(([vehicle, list]) => (
        <div key={vehicle} className="flex flex-wrap items-center gap-1.5">
          <dt className="mr-1 text-sm font-medium text-ink">{vehicle}</dt>
          {list.map((row) => (
            <dd key={row.variantId}>
              <FitmentBadge row={row} />
            </dd>
          ))}
        </div>
      ))}
    </dl>
  );
}

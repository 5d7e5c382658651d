import { Link } from "react-router";
import { formatDate } from "~/utils/format";
import { FITMENT_LABELS, type FitmentStatus } from "~/utils/vocab";

export type AuthorReport = {
  id: number;
  slug: string;
  title: string;
  vehicle: string;
  outcome: string;
  note: string | null;
  updatedAt: Date | string | null;
};

/** The Workbench's short list of readers' newest fitment reports on the author's guides. */
export function WorkbenchFitmentReports({ reports }: { reports: AuthorReport[] }) {
  if (reports.length === 0) return null;
  return (
    <section aria-labelledby="bench-reports-heading" className="mt-10">
      <h2 id="bench-reports-heading" className="font-serif text-xl font-semibold text-spruce-900">
        Readers' fitment reports
      </h2>
      <ul className="mt-3 divide-y divide-rule rounded-lg border border-rule bg-white">
        {reports.map((r) => (
          <li key={r.id} className="px-4 py-3 text-sm">
            <p>
              <span className="font-semibold">{FITMENT_LABELS[r.outcome as FitmentStatus] ?? r.outcome}</span> ·{" "}
              <span className="break-words">{r.vehicle}</span>
            </p>
            {r.note ? <p className="mt-1 break-words">{r.note}</p> : null}
            <p className="mt-1 text-ink-soft">
              <Link
                to={`/guides/${encodeURIComponent(r.slug)}#fitment-reports`}
                className="inline-flex min-h-11 items-center underline"
              >
                {r.title}
              </Link>
              {r.updatedAt ? ` · ${formatDate(new Date(r.updatedAt))}` : null}
            </p>
          </li>
        ))}
      </ul>
    </section>
  );
}

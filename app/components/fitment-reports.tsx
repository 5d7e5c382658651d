import { Form, Link } from "react-router";
import { HIDE_REASON_MAX, REPORT_NOTE_MAX } from "~/models/reader-limits";
import type { GuideGarage } from "~/routes/guide-garage.server";
import type { FormFailure } from "~/utils/forms";
import { formatDate } from "~/utils/format";
import { FITMENT_LABELS, FITMENT_STATUSES, type FitmentStatus } from "~/utils/vocab";

const primary = "min-h-11 rounded-md bg-spruce-800 px-4 py-2 font-semibold text-paper hover:bg-spruce-700";
const quiet =
  "min-h-11 rounded-md border border-rule bg-white px-4 py-2 text-sm font-semibold text-spruce-800 hover:bg-paper-deep";

type ReportFormProps = {
  slug: string;
  vehicles: GuideGarage["myVehicles"];
  reports: GuideGarage["myReports"];
  failure?: FormFailure | null;
};

/** The reader's report on one of their saved vehicles; it fills in their earlier report for the current vehicle, to edit it. */
export function ReportForm({ slug, vehicles, reports, failure }: ReportFormProps) {
  const current = vehicles.find((v) => v.current) ?? vehicles[0];
  const typed = failure?.values;
  const chosenId = typed?.vehicleId ? Number(typed.vehicleId) : current?.id;
  const chosen = vehicles.find((v) => v.id === chosenId) ?? current;
  const earlier = chosen ? reports.find((r) => r.variantId === chosen.variantId) : undefined;
  const outcome = typed?.outcome ?? earlier?.outcome ?? "";
  const note = typed?.note ?? earlier?.note ?? "";
  const errors = failure?.fields ?? {};
  return (
    <Form method="post" action={`/guides/${encodeURIComponent(slug)}/fitment-reports`} className="space-y-4">
      <input type="hidden" name="intent" value="report" />
      <div>
        <label htmlFor="report-vehicle" className="block text-sm font-semibold">
          Your vehicle
        </label>
        <select
          id="report-vehicle"
          name="vehicleId"
          defaultValue={chosen?.id}
          aria-invalid={errors.vehicleId ? true : undefined}
          aria-describedby={errors.vehicleId ? "report-vehicle-error" : undefined}
          className="mt-1 min-h-11 w-full rounded-md border border-rule bg-paper px-3 py-2"
        >
          {vehicles.map((v) => (
            <option key={v.id} value={v.id}>
              {v.nickname ? `${v.nickname} (${v.label})` : v.label}
            </option>
          ))}
        </select>
        {errors.vehicleId ? (
          <p id="report-vehicle-error" className="mt-1 text-sm font-medium text-z-danger">
            {errors.vehicleId}
          </p>
        ) : null}
      </div>
      <fieldset aria-describedby={errors.outcome ? "report-outcome-error" : undefined}>
        <legend className="text-sm font-semibold">How did it fit?</legend>
        <div className="mt-1 grid gap-2 sm:grid-cols-3">
          {FITMENT_STATUSES.map((s) => (
            <label
              key={s}
              className="flex min-h-11 cursor-pointer items-center gap-2 rounded-md border border-rule bg-paper px-3 py-2 has-[:checked]:border-spruce-700 has-[:checked]:bg-spruce-50"
            >
              <input type="radio" name="outcome" value={s} defaultChecked={outcome === s} required className="h-5 w-5" />
              {s === "fits" ? "It fit" : s === "fits-with-changes" ? "It fit with changes" : "It did not fit"}
            </label>
          ))}
        </div>
        {errors.outcome ? (
          <p id="report-outcome-error" className="mt-1 text-sm font-medium text-z-danger">
            {errors.outcome}
          </p>
        ) : null}
      </fieldset>
      <div>
        <label htmlFor="report-note" className="block text-sm font-semibold">
          Note <span className="font-normal text-ink-soft">(what you changed, or why it did not fit)</span>
        </label>
        <textarea
          id="report-note"
          name="note"
          rows={3}
          maxLength={REPORT_NOTE_MAX}
          defaultValue={note ?? ""}
          aria-invalid={errors.note ? true : undefined}
          aria-describedby={errors.note ? "report-note-error" : "report-note-hint"}
          className="mt-1 w-full rounded-md border border-rule bg-paper px-3 py-2"
        />
        <p id="report-note-hint" className="mt-1 text-xs text-ink-soft">
          Up to {REPORT_NOTE_MAX} characters. Shown on this page without your name.
        </p>
        {errors.note ? (
          <p id="report-note-error" className="mt-1 text-sm font-medium text-z-danger">
            {errors.note}
          </p>
        ) : null}
      </div>
      <button type="submit" className={primary}>
        {earlier ? "Update my report" : "Send report"}
      </button>
      {earlier?.hidden ? <p className="text-sm text-ink-soft">An editor hid your earlier report on this vehicle.</p> : null}
    </Form>
  );
}

/** Readers' fitment reports: the tally per variant, the newest notes, and the reader's own form. */
export function FitmentReports({ garage, slug }: { garage: GuideGarage; slug: string }) {
  const { tallies, reports, signedIn, myVehicles, myReports, canHide } = garage;
  const here = `/guides/${encodeURIComponent(slug)}`;
  return (
    <section
      id="fitment-reports"
      aria-labelledby="fitment-reports-heading"
      className="no-print mx-auto max-w-6xl scroll-mt-4 px-4 pb-10 sm:px-6"
    >
      <div className="max-w-3xl rounded-lg border border-rule bg-white p-4 sm:p-6">
        <h2 id="fitment-reports-heading" className="font-serif text-xl font-semibold text-spruce-900">
          Readers' fitment reports
        </h2>
        {tallies.length === 0 ? (
          <p className="mt-2 text-sm text-ink-soft">No reader has reported on this guide yet.</p>
        ) : (
          <ul className="mt-3 divide-y divide-rule text-sm">
            {tallies.map((t) => (
              <li key={t.variantId} className="py-2">
                <p className="break-words font-semibold">{t.vehicle}</p>
                <p className="text-ink-soft">
                  {t.fits} fit · {t.fitsWithChanges} fit with changes · {t.doesNotFit} did not fit
                </p>
              </li>
            ))}
          </ul>
        )}
        {reports.some((r) => r.note) ? (
          <>
            <h3 className="mt-5 font-semibold">What readers say</h3>
            <ul className="mt-2 space-y-3 text-sm">
              {reports
                .filter((r) => r.note)
                .map((r) => (
                  <li key={r.id} className="rounded-md border border-rule bg-paper px-3 py-2">
                    <p className="font-semibold">
                      {FITMENT_LABELS[r.outcome as FitmentStatus]} · <span className="break-words font-normal">{r.vehicle}</span>
                    </p>
                    <p className="mt-1 break-words">{r.note}</p>
                    <p className="mt-1 text-xs text-ink-soft">A reader, {formatDate(new Date(r.at))}</p>
                    {canHide ? (
                      <details className="mt-2">
                        <summary className="inline-flex min-h-11 cursor-pointer items-center text-sm font-semibold text-z-danger">
                          Hide this report
                        </summary>
                        <Form method="post" action={`${here}/fitment-reports`} className="mt-2 flex flex-wrap items-end gap-2">
                          <input type="hidden" name="intent" value="hide" />
                          <input type="hidden" name="reportId" value={r.id} />
                          <div className="min-w-0 flex-1 basis-56">
                            <label htmlFor={`hide-reason-${r.id}`} className="block text-sm font-semibold">
                              Reason (kept in the audit log)
                            </label>
                            <input
                              id={`hide-reason-${r.id}`}
                              name="reason"
                              required
                              minLength={3}
                              maxLength={HIDE_REASON_MAX}
                              className="mt-1 min-h-11 w-full rounded-md border border-rule bg-white px-3 py-2"
                            />
                          </div>
                          <button type="submit" className={quiet}>
                            Hide
                          </button>
                        </Form>
                      </details>
                    ) : null}
                  </li>
                ))}
            </ul>
          </>
        ) : null}
        <h3 className="mt-6 font-semibold">Report how it fit your vehicle</h3>
        <div className="mt-2">
          {!signedIn ? (
            <p className="text-sm">
              <Link
                to={`/login?redirectTo=${encodeURIComponent(`${here}#fitment-reports`)}`}
                className="inline-flex min-h-11 items-center underline"
              >
                Sign in to report fitment
              </Link>
            </p>
          ) : myVehicles.length === 0 ? (
            <p className="text-sm">
              <Link to="/me/vehicles" className="inline-flex min-h-11 items-center underline">
                Save your vehicle in My vehicles
              </Link>{" "}
              to report how this guide fit it.
            </p>
          ) : (
            <ReportForm slug={slug} vehicles={myVehicles} reports={myReports} />
          )}
        </div>
      </div>
    </section>
  );
}

import { Form, Link } from "react-router";
import type { GuideGarage } from "~/routes/guide-garage.server";
import type { FitmentStatus } from "~/utils/vocab";
import { VehiclePicker } from "./vehicle-picker";

type FitmentLike = { variantId: number; status: string; note?: string | null };

const VERDICT: Record<FitmentStatus | "not-listed", { mark: string; words: string; box: string }> = {
  fits: { mark: "●", words: "Fits your", box: "border-spruce-500 bg-spruce-50" },
  "fits-with-changes": { mark: "◐", words: "Fits with changes on your", box: "border-brass-500 bg-brass-50" },
  "does-not-fit": { mark: "✕", words: "Does not fit your", box: "border-z-danger bg-white" },
  "not-listed": { mark: "?", words: "Not listed for your", box: "border-rule bg-white" },
};

const quiet =
  "inline-flex min-h-11 items-center rounded-md border border-rule bg-white px-4 py-2 text-sm font-semibold text-spruce-800 hover:bg-paper-deep";

/**
 * The top of a guide page: whether the guide fits the reader's current vehicle (by the author's
 * fitment matrix), with the author's note for "fits with changes", or the vehicle picker when there
 * is no current vehicle (or the reader asked to pick another).
 */
export function GuideVehicleLine({ garage, fitment, slug }: { garage: GuideGarage; fitment: FitmentLike[]; slug: string }) {
  const { vehicle, picker, offer, signedIn } = garage;
  const here = `/guides/${encodeURIComponent(slug)}`;
  const row = vehicle ? fitment.find((f) => f.variantId === vehicle.variantId) : undefined;
  const status = (row?.status as FitmentStatus | undefined) ?? "not-listed";
  const verdict = VERDICT[status] ?? VERDICT["not-listed"];
  const tally = vehicle ? garage.tallies.find((t) => t.variantId === vehicle.variantId) : undefined;
  return (
    <div className="no-print mx-auto max-w-6xl px-4 pt-6 sm:px-6">
      {vehicle ? (
        <section aria-label="Fitment for your vehicle" className={`rounded-lg border-l-4 px-4 py-3 ${verdict.box}`}>
          <p className="font-semibold">
            <span aria-hidden="true">{verdict.mark} </span>
            {verdict.words} <span className="break-words">{vehicle.label}</span>
          </p>
          {status === "fits-with-changes" && row?.note ? (
            <p className="mt-1 text-sm">
              <span className="font-semibold">The author's note: </span>
              {row.note}
            </p>
          ) : null}
          {status === "not-listed" ? (
            <p className="mt-1 text-sm text-ink-soft">The author has not said whether it fits this vehicle.</p>
          ) : null}
          {tally ? (
            <p className="mt-1 text-sm text-ink-soft">
              Readers with this vehicle: {tally.fits} fit, {tally.fitsWithChanges} fit with changes, {tally.doesNotFit} did not
              fit.
            </p>
          ) : null}
          <div className="mt-2 flex flex-wrap gap-2">
            {signedIn ? (
              <Link to="/me/vehicles" className={quiet}>
                Change vehicle
              </Link>
            ) : (
              <>
                <Link to={`${here}?pick=1#vehicle-picker`} preventScrollReset className={quiet}>
                  Pick another vehicle
                </Link>
                <Form method="post" action="/pick-vehicle">
                  <input type="hidden" name="intent" value="forget" />
                  <input type="hidden" name="returnTo" value={here} />
                  <button type="submit" className={quiet}>
                    Forget this vehicle
                  </button>
                </Form>
              </>
            )}
          </div>
        </section>
      ) : null}
      {offer ? (
        <Form
          method="post"
          action="/pick-vehicle"
          className="mt-3 flex flex-wrap items-center gap-3 rounded-lg border border-rule bg-white px-4 py-3"
        >
          <p className="min-w-0 flex-1 basis-60 text-sm">
            You picked <strong>{offer.label}</strong> before signing in.
          </p>
          <input type="hidden" name="intent" value="pick" />
          <input type="hidden" name="variantId" value={offer.variantId} />
          <input type="hidden" name="year" value={offer.year} />
          <input type="hidden" name="returnTo" value={here} />
          <button type="submit" className={quiet}>
            Save to My vehicles
          </button>
        </Form>
      ) : null}
      {picker ? (
        <section
          id="vehicle-picker"
          aria-labelledby="vehicle-picker-heading"
          className="mt-3 scroll-mt-4 rounded-lg border border-rule bg-white p-4"
        >
          <h2 id="vehicle-picker-heading" className="font-serif text-lg font-semibold text-spruce-900">
            Does this fit your vehicle?
          </h2>
          <p className="mb-3 text-sm text-ink-soft">
            Pick your vehicle and the guide says whether it fits.{signedIn ? " It is saved to My vehicles." : ""}
          </p>
          <VehiclePicker
            options={picker}
            stepsAction={`${here}#vehicle-picker`}
            saveAction="/pick-vehicle"
            submitLabel="Use this vehicle"
          >
            <input type="hidden" name="intent" value="pick" />
            <input type="hidden" name="returnTo" value={here} />
          </VehiclePicker>
          {vehicle ? (
            <p className="mt-3 text-sm">
              <Link to={here} preventScrollReset className="inline-flex min-h-11 items-center underline">
                Keep {vehicle.label}
              </Link>
            </p>
          ) : null}
        </section>
      ) : null}
    </div>
  );
}

import { Link } from "react-router";
import { z } from "zod";
import { ReportForm } from "~/components/fitment-reports";
import { FailureNotice } from "~/components/form";
import { getDb } from "~/db/client.server";
import {
  hideFitmentReport,
  hideInputSchema,
  ownReports,
  reportFieldsSchema,
  reportRules,
  submitFitmentReport,
} from "~/models/fitment-reports.server";
import { getPublishedGuide } from "~/models/library.server";
import { listVehicles } from "~/models/vehicles.server";
import { requireUser } from "~/services/auth/guards.server";
import { getStorage } from "~/services/storage.server";
import { notFound } from "~/utils/errors";
import { failureOf } from "~/utils/forms";
import { formHeaders, handleForm, redirectWithFlash } from "~/utils/forms.server";
import { forPage } from "~/utils/http.server";
import type { Route } from "./+types/guide.fitment-reports";

export const meta: Route.MetaFunction = ({ data }) => [
  { title: `Report fitment${data ? `: ${data.title}` : ""} · Torqueleaf` },
  { name: "robots", content: "noindex" },
];

/** The report form on a page of its own: where the guide page's form lands when a field needs attention. */
export async function loader(args: Route.LoaderArgs) {
  const user = await requireUser(args);
  return forPage(async () => {
    const db = await getDb();
    const guide = await getPublishedGuide(db, getStorage(), args.params.slug);
    if (!guide) throw notFound(`A published guide called "${args.params.slug}"`);
    const [vehicles, reports] = await Promise.all([listVehicles(db, user.id), ownReports(db, user.id, guide.id)]);
    return {
      slug: guide.slug,
      title: guide.title,
      vehicles: vehicles.map(({ id, variantId, label, nickname, current }) => ({ id, variantId, label, nickname, current })),
      reports,
    };
  });
}

const intentSchema = z.discriminatedUnion(
  "intent",
  [
    z.object({ intent: z.literal("report"), ...reportFieldsSchema.shape }).superRefine(reportRules),
    z.object({ intent: z.literal("hide"), ...hideInputSchema.shape }),
  ],
  { error: "Choose one of the actions on this page." },
);

/** A reader's report (new or replacing their earlier one), or an editor hiding a report with a reason. */
export async function action(args: Route.ActionArgs) {
  const user = await requireUser(args);
  const back = `/guides/${encodeURIComponent(args.params.slug)}#fitment-reports`;
  return handleForm(args.request, intentSchema, async (input) => {
    const db = await getDb();
    if (input.intent === "hide") {
      const { alreadyHidden } = await hideFitmentReport(db, user, input);
      return redirectWithFlash(back, {
        tone: "success",
        text: alreadyHidden ? "That report was hidden already." : "The report is hidden.",
      });
    }
    const report = await submitFitmentReport(db, user, args.params.slug, input);
    return redirectWithFlash(back, {
      tone: "success",
      text: report.replaced ? "Your fitment report is updated. Thank you." : "Thank you for reporting how it fit.",
    });
  });
}

export const headers = formHeaders;

export default function ReportFitment({ loaderData, actionData }: Route.ComponentProps) {
  const failure = failureOf(actionData);
  const { slug, title, vehicles, reports } = loaderData;
  return (
    <div className="mx-auto max-w-3xl px-4 py-8 sm:px-6 sm:py-10">
      <p className="text-sm">
        <Link to={`/guides/${encodeURIComponent(slug)}`} className="inline-flex min-h-11 items-center underline">
          Back to the guide
        </Link>
      </p>
      <h1 className="font-serif text-2xl font-semibold text-spruce-900">Report fitment: {title}</h1>
      {failure ? (
        <div className="mt-4">
          <FailureNotice failure={failure} focusOn={actionData} />
        </div>
      ) : null}
      <div className="mt-4 rounded-lg border border-rule bg-white p-4">
        {vehicles.length === 0 ? (
          <p>
            <Link to="/me/vehicles" className="inline-flex min-h-11 items-center underline">
              Save your vehicle in My vehicles
            </Link>{" "}
            first.
          </p>
        ) : (
          <ReportForm slug={slug} vehicles={vehicles} reports={reports} failure={failure} />
        )}
      </div>
    </div>
  );
}

export { RouteErrorBoundary as ErrorBoundary } from "~/components/error-page";

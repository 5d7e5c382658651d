import { getDb } from "~/db/client.server";
import { readContentStamps } from "~/models/content-stamps.server";
import { publicReports } from "~/models/fitment-reports.server";
import { getPublishedGuide } from "~/models/library.server";
import { unpublishedGuide } from "~/models/review-desk.server";
import { getStorage } from "~/services/storage.server";
import { AppError } from "~/utils/errors";
import { anonymousJson } from "~/services/http/anonymous-answers.server";
import { apiHandler } from "~/utils/http.server";
import type { Route } from "./+types/api.guide";

export const loader = apiHandler(async ({ params, request }: Route.LoaderArgs) => {
  const db = await getDb();
  const stamps = await readContentStamps(db);
  const guide = await getPublishedGuide(db, getStorage(), params.slug, stamps);
  if (!guide) {
    const gone = await unpublishedGuide(db, params.slug);
    if (gone) {
      throw new AppError(410, "unpublished", `"${gone.title}" was taken out of the Library by an editor.`, undefined, {
        reason: gone.reason,
        unpublishedAt: gone.at,
      });
    }
    throw new AppError(404, "not-found", `No published guide is called "${params.slug}".`);
  }
  const { id, ...rest } = guide;
  // Readers' reports per variant, hidden ones not counted; a new report changes the answer's ETag.
  const { tallies } = await publicReports(db, id, stamps);
  const fitmentReports = tallies.map(({ vehicle: _name, ...tally }) => tally);
  return anonymousJson(request, stamps, {
    ...rest,
    steps: rest.steps.map(({ callouts, ...step }) => ({
      ...step,
      callouts: callouts.map(({ result, ...callout }) => ({ ...callout, computed: result })),
    })),
    fitmentReports,
  });
});

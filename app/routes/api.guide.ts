import { getDb } from "~/db/client.server";
import { getPublishedGuide } from "~/models/library.server";
import { getStorage } from "~/services/storage.server";
import { AppError } from "~/utils/errors";
import { apiHandler, publicJson } from "~/utils/http.server";
import type { Route } from "./+types/api.guide";

export const loader = apiHandler(async ({ params, request }: Route.LoaderArgs) => {
  const guide = await getPublishedGuide(await getDb(), getStorage(), params.slug);
  if (!guide) throw new AppError(404, "not-found", `No published guide is called "${params.slug}".`);
  const { id: _id, ...rest } = guide;
  return publicJson(request, {
    ...rest,
    steps: rest.steps.map(({ callouts, ...step }) => ({
      ...step,
      callouts: callouts.map(({ result, ...callout }) => ({ ...callout, computed: result })),
    })),
  });
});

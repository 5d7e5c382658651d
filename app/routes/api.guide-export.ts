import { z } from "zod";
import { assertCanReadDraft } from "~/models/drafts.server";
import { exportDraftJson, exportMarkdownZip } from "~/models/guide-export.server";
import { getStorage } from "~/services/storage.server";
import { invalid } from "~/utils/errors";
import { apiHandler } from "~/utils/http.server";
import type { Route } from "./+types/api.guide-export";
import { apiGuide, PRIVATE_JSON } from "./authoring-api.server";

const querySchema = z.enum(["markdown", "json"], { error: 'Choose format "markdown" (a zip of guide.md and photos) or "json"' });

/** A file name made of the slug alone (lowercase letters, digits and hyphens by construction). */
const attachment = (name: string) => `attachment; filename="${name.replace(/[^a-z0-9.-]/g, "-")}"`;

/**
 * The author's (or an editor's) copy of a guide's draft: `?format=json` the draft JSON that
 * `POST /api/guides/import` reads back, `?format=markdown` a zip of guide.md and its photos.
 */
export const loader = apiHandler(async (args: Route.LoaderArgs) => {
  const { user, db, guide, guideId } = await apiGuide(args);
  assertCanReadDraft(user, guide);
  const format = querySchema.safeParse(new URL(args.request.url).searchParams.get("format") ?? "json");
  if (!format.success) throw invalid({ format: format.error.issues[0].message });
  if (format.data === "json") {
    const { slug, body } = await exportDraftJson(db, getStorage(), user, guideId);
    return Response.json(body, { headers: { ...PRIVATE_JSON, "Content-Disposition": attachment(`${slug}.json`) } });
  }
  const { slug, zip } = await exportMarkdownZip(db, getStorage(), user, guideId);
  return new Response(new Uint8Array(zip), {
    headers: {
      ...PRIVATE_JSON,
      "Content-Type": "application/zip",
      "Content-Length": String(zip.byteLength),
      "Content-Disposition": attachment(`${slug}.zip`),
    },
  });
});

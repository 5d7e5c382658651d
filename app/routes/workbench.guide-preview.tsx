import { eq } from "drizzle-orm";
import { Link } from "react-router";
import { GuideArticle, type ShownGuide } from "~/components/guide-article";
import { getDb } from "~/db/client.server";
import { users } from "~/db/schema";
import { getGuideById } from "~/models/guides.server";
import { revisionView } from "~/models/library.server";
import { requireUser } from "~/services/auth/guards.server";
import { getStorage } from "~/services/storage.server";
import { env } from "~/utils/env.server";
import { forbidden, notFound } from "~/utils/errors";
import { forPage } from "~/utils/http.server";
import { canOn } from "~/utils/permissions";
import type { Route } from "./+types/workbench.guide-preview";

export const meta: Route.MetaFunction = ({ data }) => [
  { title: `Preview: ${data?.guide.title ?? "guide"} · Torqueleaf` },
  { name: "robots", content: "noindex" },
];

/** The working revision (or the published one when no draft is open) through the reader page's own view. */
export async function loader(args: Route.LoaderArgs) {
  const user = await requireUser(args);
  return forPage(async () => {
    const db = await getDb();
    const id = Number(args.params.id);
    const guide = Number.isSafeInteger(id) && id > 0 ? await getGuideById(db, id) : undefined;
    if (!guide) throw notFound("This guide");
    if (!canOn(user, "update:guide", guide) && !canOn(user, "read:revision", { guide })) throw forbidden();
    const revisionId = guide.workingRevisionId ?? guide.publishedRevisionId;
    const view = revisionId ? await revisionView(db, getStorage(), revisionId) : null;
    if (!view) throw notFound("This guide's draft");
    const [author] = await db
      .select({ id: users.id, name: users.name, bio: users.bio })
      .from(users)
      .where(eq(users.id, guide.authorId));
    const shown: ShownGuide = {
      id: guide.id,
      slug: guide.slug,
      title: view.title,
      summary: view.summary,
      category: view.category,
      difficulty: view.difficulty,
      minutes: view.minutes,
      author,
      publishedAt: null,
      revision: view.revision,
      steps: view.steps,
      parts: view.parts,
      tools: view.tools,
      fitment: view.fitment,
    };
    return {
      guide: shown,
      url: new URL(`/guides/${encodeURIComponent(guide.slug)}`, env().APP_ORIGIN).href,
      draft: revisionId === guide.workingRevisionId,
    };
  });
}

export default function GuidePreview({ loaderData }: Route.ComponentProps) {
  const { guide, url, draft } = loaderData;
  return (
    <div>
      <div role="note" className="border-b-2 border-brass-500 bg-brass-50 px-4 py-3 text-sm sm:px-6">
        <div className="mx-auto flex max-w-6xl flex-wrap items-center justify-between gap-2">
          <p>
            <strong>Preview</strong> of {draft ? "the draft" : "the published guide"}, revision {guide.revision.number}, as
            readers will see it once it is published. It shows what was last saved.
          </p>
          <Link
            to={`/workbench/guides/${guide.id}`}
            className="inline-flex min-h-11 items-center font-semibold text-spruce-700 underline"
          >
            Back to the editor
          </Link>
        </div>
      </div>
      <GuideArticle
        guide={{
          ...guide,
          revision: { ...guide.revision, reviewedAt: guide.revision.reviewedAt ? new Date(guide.revision.reviewedAt) : null },
        }}
        url={url}
        print={false}
      />
    </div>
  );
}

export { RouteErrorBoundary as ErrorBoundary } from "~/components/error-page";

import { FitmentReports } from "~/components/fitment-reports";
import { DocumentJson, dataBlockJson, useDocumentJson } from "~/components/document-html";
import { GuideArticle, type ShownGuide, stepBodyId } from "~/components/guide-article";
import { KeepOnDevice } from "~/components/keep-on-device";
import { GuideVehicleLine } from "~/components/vehicle-fitment-line";
import { StepDoneTick, WorkThroughProgress, WorkThroughProvider } from "~/components/work-through";
import { getDb } from "~/db/client.server";
import { readRequestStamps } from "~/models/content-stamps.server";
import { getPublishedGuide, type PublishedGuide } from "~/models/library.server";
import { unpublishedGuide } from "~/models/review-desk.server";
import { documentFragmentsContext } from "~/services/http/document-fragments.server";
import { isDocumentRequest } from "~/services/http/request-kind.server";
import { getStorage } from "~/services/storage.server";
import { BoundedCache } from "~/utils/bounded-cache";
import { env } from "~/utils/env.server";
import { keepUnitsTogetherInHtml } from "~/utils/format";
import { AppError, notFound } from "~/utils/errors";
import { formatDate } from "~/utils/format";
import { pageErrorResponse } from "~/utils/http.server";
import { READER_PAGE } from "~/utils/reader-page";
import { CATEGORY_LABELS, type Category } from "~/utils/vocab";
import type { Route } from "./+types/guide";
import { guideGarage } from "./guide-garage.server";

type Photo = PublishedGuide["steps"][number]["photos"][number];

/** The photo a link preview shows: a JPEG about 1200 px wide (the usual size for link cards), as an absolute URL. */
function shareImage(photo: Photo, origin: string) {
  const jpegs = photo.variants.filter((v) => v.format === "jpeg").sort((a, b) => a.width - b.width);
  const chosen = jpegs.find((v) => v.width >= 1200) ?? jpegs.at(-1);
  if (!chosen) return null;
  return {
    url: new URL(chosen.url, origin).href,
    width: chosen.width,
    height: Math.round((chosen.width * photo.height) / photo.width),
    alt: photo.alt,
  };
}

/** Step HTML as shown, kept by the stored HTML (it never changes for a published revision). */
const shownHtml = new BoundedCache<string, string>(4 * 1024 * 1024, (html) => html.length);
function stepHtmlShown(html: string) {
  let shown = shownHtml.get(html);
  if (shown === undefined) {
    shown = keepUnitsTogetherInHtml(html);
    shownHtml.set(html, shown);
  }
  return shown;
}

/**
 * The guide travels to the page as one JSON string, made once per published revision view (and
 * per document or navigation, and what of the guide row it shows), so React Router hands over one
 * string instead of walking the whole guide on every request. Kept beside the view it came from.
 */
const guideJson = new WeakMap<object, Map<string, string>>();

function shownGuideJson(found: PublishedGuide, document: boolean, bodies: string[]): string {
  const row = JSON.stringify([document, found.id, found.slug, found.author, found.publishedAt]);
  const byRow = guideJson.get(found.steps) ?? new Map<string, string>();
  guideJson.set(found.steps, byRow);
  let json = byRow.get(row);
  if (json === undefined) {
    const guide: ShownGuide = {
      ...found,
      steps: found.steps.map(({ html: _html, ...step }, i) => ({ ...step, html: document ? undefined : bodies[i] })),
    };
    // A document's JSON goes into a data block (DocumentJson).
    json = document ? dataBlockJson(guide) : JSON.stringify(guide);
    byRow.set(row, json);
  }
  return json;
}

/** The data block a document's guide comes in. */
const GUIDE_JSON_ID = "guide-data";

/** What the page's `meta` needs of the guide: a document's data carries no guide. */
function guideHead(found: PublishedGuide) {
  return {
    title: found.title,
    summary: found.summary,
    category: found.category,
    publishedAt: found.publishedAt?.toISOString() ?? null,
    revisionPublishedAt: found.history?.find((h) => h.number === found.revision.number)?.publishedAt?.toISOString() ?? null,
  };
}

let lastRead: { json: string; guide: ShownGuide } | undefined;

/** The guide back from its JSON, its dates as dates; the last one read is kept for meta and the page. */
function readGuide(json: string): ShownGuide {
  if (lastRead?.json === json) return lastRead.guide;
  const parsed = JSON.parse(json) as ShownGuide;
  const date = (value: Date | string | null) => (value === null ? null : new Date(value));
  const guide = {
    ...parsed,
    publishedAt: date(parsed.publishedAt),
    revision: { ...parsed.revision, reviewedAt: date(parsed.revision.reviewedAt) },
    history: parsed.history?.map((h) => ({ ...h, reviewedAt: date(h.reviewedAt), publishedAt: date(h.publishedAt) })),
  };
  lastRead = { json, guide };
  return guide;
}

/** What a reader is told at the address of a guide an editor unpublished. */
function unpublishedMessage(gone: { title: string; reason: string | null; at: Date | null }) {
  const when = gone.at ? ` on ${formatDate(gone.at)}` : "";
  return `"${gone.title}" was unpublished${when}. The editor's reason: ${gone.reason ?? "not given"}`;
}

export async function loader({ params, request, context }: Route.LoaderArgs) {
  const db = await getDb();
  // Read once, before anything the page shows: what is kept is looked up by these.
  const stamps = await readRequestStamps(context, db);
  const found = await getPublishedGuide(db, getStorage(), params.slug, stamps);
  if (!found) {
    const gone = await unpublishedGuide(db, params.slug);
    if (gone) throw pageErrorResponse(new AppError(410, "unpublished", unpublishedMessage(gone)));
    throw pageErrorResponse(notFound(`A published guide called "${params.slug}"`));
  }
  // The steps' HTML goes into the markup once; a document's data leaves it out (DocumentHtml). The
  // rest of the guide goes into the document as a data block (DocumentJson); a navigation's data
  // carries it all.
  const bodies = found.steps.map((step) => stepHtmlShown(step.html));
  const document = isDocumentRequest(request);
  const json = shownGuideJson(found, document, bodies);
  if (document) {
    context.set(
      documentFragmentsContext,
      new Map([...bodies.map((html, i) => [stepBodyId(i), html] as const), [GUIDE_JSON_ID, json]]),
    );
  }
  // Addresses for the canonical link, Open Graph and the printed page come from the configured public
  // origin, never from the request's Host header.
  const origin = env().APP_ORIGIN;
  const url = new URL(`/guides/${encodeURIComponent(found.slug)}`, origin).href;
  const photo = found.steps.flatMap((s) => s.photos)[0];
  const image = photo ? shareImage(photo, origin) : null;
  return {
    guide: document ? null : json,
    head: guideHead(found),
    url,
    image,
    print: new URL(request.url).searchParams.get("print") === "1",
    // The reader's vehicle and readers' fitment reports: per request, never part of the kept guide JSON.
    garage: await guideGarage({ request, context }, db, found.id, stamps),
  };
}

/** The same for every reader who is not signed in: rendered once, and a browser may keep it. */
export const handle = READER_PAGE;

export const meta: Route.MetaFunction = ({ data }) => {
  if (!data) return [{ title: "Guide not found · Torqueleaf" }];
  const { url, image, head: guide } = data;
  const revisionPublished = guide.revisionPublishedAt ? new Date(guide.revisionPublishedAt) : null;
  const publishedAt = guide.publishedAt ? new Date(guide.publishedAt) : null;
  return [
    { title: `${guide.title} · Torqueleaf` },
    { name: "description", content: guide.summary },
    // The print view is the same guide: both name the guide page as the one address to index and share.
    { tagName: "link", rel: "canonical", href: url },
    { property: "og:site_name", content: "Torqueleaf" },
    { property: "og:type", content: "article" },
    { property: "og:title", content: guide.title },
    { property: "og:description", content: guide.summary },
    { property: "og:url", content: url },
    // The article's own properties (ogp.me, "article" type): when it came out, when this revision did, its section.
    ...(publishedAt ? [{ property: "article:published_time", content: publishedAt.toISOString() }] : []),
    ...(revisionPublished ? [{ property: "article:modified_time", content: revisionPublished.toISOString() }] : []),
    { property: "article:section", content: CATEGORY_LABELS[guide.category as Category] },
    ...(image
      ? [
          { property: "og:image", content: image.url },
          { property: "og:image:type", content: "image/jpeg" },
          { property: "og:image:width", content: String(image.width) },
          { property: "og:image:height", content: String(image.height) },
          { property: "og:image:alt", content: image.alt },
        ]
      : []),
  ];
};

export default function GuidePage({ loaderData }: Route.ComponentProps) {
  const { url, print, garage } = loaderData;
  const guide = readGuide(useDocumentJson(GUIDE_JSON_ID, loaderData.guide));
  const work = print
    ? undefined
    : {
        headerActions: <KeepOnDevice guide={guide} />,
        beforeSteps: <WorkThroughProgress />,
        afterStep: (index: number) => <StepDoneTick index={index} />,
      };
  return (
    <WorkThroughProvider slug={guide.slug} revision={guide.revision.number} stepCount={guide.steps.length}>
      {print ? null : <GuideVehicleLine garage={garage} fitment={guide.fitment} slug={guide.slug} />}
      {loaderData.guide === null ? <DocumentJson id={GUIDE_JSON_ID} /> : null}
      <GuideArticle guide={guide} url={url} print={print} work={work} />
      {print ? null : <FitmentReports garage={garage} slug={guide.slug} />}
    </WorkThroughProvider>
  );
}

export { RouteErrorBoundary as ErrorBoundary } from "~/components/error-page";

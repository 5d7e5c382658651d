import { beforeAll, describe, expect, inject, it } from "vitest";
import { ACCOUNTS, all, call, only, type Probe, routePatterns, signedIn, signInOverHttp, WHO, type Who } from "./matrix-support";

/**
 * THE AUTHORIZATION MATRIX: who gets which status from every route in app/routes.ts, called over
 * HTTP on the built app. A route without a row fails the suite, so a new route must say here who
 * may use it. Columns: anonymous, reader, author on their own object, author on another author's,
 * editor, admin. Pages answer a missing sign-in with 302 to /login, the API with 401.
 *
 * To add a route: add a row keyed by its pattern exactly as in app/routes.ts (with a leading "/"),
 * with one probe per method it serves. For objects with an owner use a path function, e.g.
 * `path: (who) => \`/workbench/guides/${who === "authorOther" ? fixtures.otherGuideId : fixtures.ownGuideId}\``.
 */

const origin = inject("origin");
const fixtures = {
  publishedSlug: "kestrel-hood-auxiliary-lamps",
  /** In review in the demo data: not public. */
  unpublishedSlug: "fjell-phev-rear-usb-charger",
  photo: "",
  /** The demo author's draft (the seed's seventh guide) and another author's published guide (its second). */
  ownGuideId: 7,
  otherGuideId: 2,
  /** The revision in review (the seed's sixth guide's first revision, by the demo author). */
  inReviewRevisionId: 6,
  /** The demo reader's checklist of the published guide and its first item, saved in beforeAll. */
  checklistId: 0,
  itemId: 0,
};
/** The reader's own checklist: the reader is its owner, everyone else is another account. */
const checklistPath =
  (suffix = "") =>
  () =>
    `/api/checklists/${fixtures.checklistId}${suffix}`;
const checklistItemPath = () => () => `/api/checklists/${fixtures.checklistId}/items/${fixtures.itemId}`;
const checklistPage =
  (suffix = "") =>
  () =>
    `/me/checklists/${fixtures.checklistId}${suffix}`;
const ownerOnly = (ok: number, anonymous: number) => only(["reader"], ok, 403, anonymous);
const guidePath = (suffix: string) => (who: Who) =>
  `/api/guides/${who === "authorOther" ? fixtures.otherGuideId : fixtures.ownGuideId}/${suffix}`;
const editorPath = (suffix: string) => (who: Who) =>
  `/workbench/guides/${who === "authorOther" ? fixtures.otherGuideId : fixtures.ownGuideId}${suffix}`;
const badToken = "not-a-real-token-0123456789abcdefghijklmnop";

const MATRIX: Record<string, Probe[]> = {
  "/": [{ path: "/", expect: all(200) }],
  "/guides/:slug": [
    { path: `/guides/${fixtures.publishedSlug}`, expect: all(200) },
    { path: `/guides/${fixtures.unpublishedSlug}`, expect: all(404) },
  ],
  "/tools/circuit": [
    { path: "/tools/circuit", expect: all(200) },
    { method: "POST", path: "/tools/circuit", form: { intent: "check" }, expect: all(200) },
  ],
  "/media/*": [
    { path: () => fixtures.photo, expect: all(200) },
    { path: "/media/photos/none/missing.webp", expect: all(404) },
  ],
  // The e2e server runs with LOCAL_FAKES=1; without it the route answers 404 to everyone.
  "/dev/inbox": [{ path: "/dev/inbox", expect: all(200) }],
  "/api/catalogue": [
    { path: "/api/catalogue", expect: all(200) },
    // Changes are the admins'; an empty body is refused by field.
    { method: "POST", path: "/api/catalogue", json: {}, expect: only(["admin"], 400, 403, 401) },
  ],
  "/api/guides": [
    { path: "/api/guides", expect: all(200) },
    // A new guide is an author's (editors and admins write too); an empty body is refused by field.
    { method: "POST", path: "/api/guides", json: {}, expect: all(400, { anonymous: 401, reader: 403 }) },
  ],
  "/api/guides/:slug": [
    { path: `/api/guides/${fixtures.publishedSlug}`, expect: all(200) },
    { path: `/api/guides/${fixtures.unpublishedSlug}`, expect: all(404) },
  ],
  // Every signed-in reader has ticks of their own (the session picks whose); an empty tick is refused by field.
  "/api/guides/:slug/step-ticks": [
    { path: `/api/guides/${fixtures.publishedSlug}/step-ticks`, expect: signedIn(200, 401) },
    { method: "PUT", path: `/api/guides/${fixtures.publishedSlug}/step-ticks`, json: {}, expect: signedIn(400, 401) },
    { path: `/api/guides/${fixtures.unpublishedSlug}/step-ticks`, expect: signedIn(404, 401) },
  ],
  // Only the draft's author writes it; editors and admins read it for review.
  "/api/guides/:id/draft": [
    { path: guidePath("draft"), expect: { ...only(["editor", "admin"], 200, 403, 401), authorOwn: 200 } },
    { method: "PUT", path: guidePath("draft"), json: {}, expect: { ...all(403, { anonymous: 401 }), authorOwn: 400 } },
  ],
  "/api/guides/import": [
    { path: "/api/guides/import", expect: all(405) },
    { method: "POST", path: "/api/guides/import", json: {}, expect: all(400, { anonymous: 401, reader: 403 }) },
  ],
  "/api/guides/:id/submit": [
    { path: guidePath("submit"), expect: all(405) },
    // A change summary that is not text: refused for the owner before anything is submitted.
    {
      method: "POST",
      path: guidePath("submit"),
      json: { changeSummary: 5 },
      expect: { ...all(403, { anonymous: 401 }), authorOwn: 400 },
    },
  ],
  "/api/guides/:id/revision": [
    { path: guidePath("revision"), expect: all(405) },
    // The demo draft is still open, so its author is handed it back (200) and nothing is copied.
    { method: "POST", path: guidePath("revision"), expect: { ...all(403, { anonymous: 401 }), authorOwn: 200 } },
  ],
  "/api/guides/:id/export": [
    { path: guidePath("export?format=json"), expect: { ...only(["editor", "admin"], 200, 403, 401), authorOwn: 200 } },
    { path: guidePath("export?format=markdown"), expect: { ...only(["editor", "admin"], 200, 403, 401), authorOwn: 200 } },
    { path: guidePath("export?format=pdf"), expect: { ...only(["editor", "admin"], 400, 403, 401), authorOwn: 400 } },
  ],
  "/api/circuit": [
    { path: "/api/circuit", expect: all(405) },
    { method: "POST", path: "/api/circuit", json: {}, expect: all(400) },
  ],
  "/api/media": [{ method: "POST", path: "/api/media", form: {}, expect: all(415, { anonymous: 401, reader: 403 }) }],
  "/api/me": [
    { path: "/api/me", expect: all(200) },
    { method: "POST", path: "/api/me", json: {}, expect: all(405) },
  ],
  // A reader's vehicles and fitment reports: their own, signed in; hiding a report is the editors'.
  "/me/vehicles": [
    { path: "/me/vehicles", expect: signedIn(200, 302) },
    { method: "POST", path: "/me/vehicles", form: { intent: "none" }, expect: signedIn(400, 302) },
  ],
  // The picker goes back with a message, for a visitor (cookie) and a reader (saved) alike.
  "/pick-vehicle": [
    { path: "/pick-vehicle", expect: all(302) },
    { method: "POST", path: "/pick-vehicle", form: { intent: "none", returnTo: "/" }, expect: all(302) },
  ],
  "/guides/:slug/fitment-reports": [
    { path: `/guides/${fixtures.publishedSlug}/fitment-reports`, expect: signedIn(200, 302) },
    { path: `/guides/${fixtures.unpublishedSlug}/fitment-reports`, expect: signedIn(404, 302) },
    {
      method: "POST",
      path: `/guides/${fixtures.publishedSlug}/fitment-reports`,
      form: { intent: "hide", reportId: "999999999", reason: "Matrix probe" },
      expect: only(["editor", "admin"], 404, 403, 302),
    },
  ],
  "/api/me/vehicles": [
    { path: "/api/me/vehicles", expect: signedIn(200, 401) },
    { method: "POST", path: "/api/me/vehicles", json: {}, expect: signedIn(400, 401) },
  ],
  "/api/me/vehicles/:id": [
    { method: "DELETE", path: "/api/me/vehicles/999999999", expect: signedIn(404, 401) },
    { path: "/api/me/vehicles/999999999", expect: all(405) },
  ],
  "/api/guides/:slug/fitment-reports": [
    { method: "POST", path: `/api/guides/${fixtures.publishedSlug}/fitment-reports`, json: {}, expect: signedIn(400, 401) },
    { path: `/api/guides/${fixtures.publishedSlug}/fitment-reports`, expect: all(405) },
  ],
  // Pages for signing in send a signed-in visitor onwards.
  "/signup": [
    { path: "/signup", expect: all(302, { anonymous: 200 }) },
    { method: "POST", path: "/signup", form: { name: "", email: "", password: "" }, expect: all(302, { anonymous: 400 }) },
  ],
  "/login": [
    { path: "/login", expect: all(302, { anonymous: 200 }) },
    { method: "POST", path: "/login", form: { email: "", password: "" }, expect: all(302, { anonymous: 400 }) },
  ],
  "/logout": [
    { path: "/logout", expect: signedIn(200, 302) },
    { method: "POST", path: "/logout", form: {}, freshSession: true, expect: all(302) },
  ],
  "/verify/:token": [
    { path: `/verify/${badToken}`, expect: all(200) },
    // An unknown link is refused as expired, and a post that is not a form is refused before that.
    { method: "POST", path: `/verify/${badToken}`, form: {}, expect: all(400) },
    { method: "POST", path: `/verify/${badToken}`, expect: all(415) },
  ],
  "/reset": [
    { path: "/reset", expect: all(200) },
    { method: "POST", path: "/reset", form: { email: "" }, expect: all(400) },
  ],
  "/reset/:token": [
    { path: `/reset/${badToken}`, expect: all(200) },
    { method: "POST", path: `/reset/${badToken}`, form: { password: "a long enough phrase" }, expect: all(400) },
  ],
  "/auth/github": [
    { path: "/auth/github", expect: all(302) },
    { method: "POST", path: "/auth/github", form: {}, expect: all(302) },
  ],
  "/auth/github/callback": [{ path: "/auth/github/callback?code=x&state=y", expect: all(302) }],
  "/auth/github/link": [
    { path: "/auth/github/link", expect: all(302) },
    { method: "POST", path: "/auth/github/link", form: { intent: "link" }, expect: all(302) },
  ],
  "/me/account": [
    { path: "/me/account", expect: signedIn(200, 302) },
    { method: "POST", path: "/me/account", form: { intent: "none" }, expect: signedIn(400, 302) },
  ],
  // A mail's opt-out link works for anyone who holds it, signed in or not; a token that is not
  // signed by the app is refused (400), a post that is not a form before that (415).
  "/mail/opt-out/:token": [
    { path: `/mail/opt-out/${badToken}`, expect: all(400) },
    { method: "POST", path: `/mail/opt-out/${badToken}`, form: { "List-Unsubscribe": "One-Click" }, expect: all(400) },
    { method: "POST", path: `/mail/opt-out/${badToken}`, expect: all(415) },
  ],
  "/contributor-terms": [
    { path: "/contributor-terms", expect: all(200) },
    // Without the tick nothing changes: a reader is told to tick it, the others already write.
    { method: "POST", path: "/contributor-terms", form: {}, expect: all(409, { anonymous: 302, reader: 400 }) },
  ],
  "/admin/users": [
    { path: "/admin/users", expect: only(["admin"], 200, 403, 302) },
    { method: "POST", path: "/admin/users", form: { intent: "none" }, expect: only(["admin"], 400, 403, 302) },
  ],
  // The audit log only reads; a filter that does not parse is 400 with the page.
  "/admin/audit": [
    { path: "/admin/audit", expect: only(["admin"], 200, 403, 302) },
    { path: "/admin/audit?page=0", expect: only(["admin"], 400, 403, 302) },
  ],
  "/admin/catalogue": [
    { path: "/admin/catalogue", expect: only(["admin"], 200, 403, 302) },
    { method: "POST", path: "/admin/catalogue", form: { intent: "none" }, expect: only(["admin"], 400, 403, 302) },
  ],
  // A reader gets the Workbench page that leads to the contributor terms; writing needs an author.
  "/workbench": [
    { path: "/workbench", expect: signedIn(200, 302) },
    { method: "POST", path: "/workbench", form: { intent: "none" }, expect: signedIn(400, 302) },
  ],
  "/workbench/guides/new": [
    { path: "/workbench/guides/new", expect: only(["author", "editor", "admin"], 200, 403, 302) },
    {
      method: "POST",
      path: "/workbench/guides/new",
      form: { title: "" },
      expect: only(["author", "editor", "admin"], 400, 403, 302),
    },
  ],
  // Editors and admins may read an author's draft (for review); only its author edits it.
  "/workbench/guides/:id": [{ path: editorPath(""), expect: { ...only(["editor", "admin"], 200, 403, 302), authorOwn: 200 } }],
  "/workbench/guides/:id/preview": [
    { path: editorPath("/preview"), expect: { ...only(["editor", "admin"], 200, 403, 302), authorOwn: 200 } },
  ],
  // The review desk: editors and admins only; a decision without an intent is refused by field.
  "/review": [{ path: "/review", expect: only(["editor", "admin"], 200, 403, 302) }],
  "/review/:revisionId": [
    { path: `/review/${fixtures.inReviewRevisionId}`, expect: only(["editor", "admin"], 200, 403, 302) },
    {
      method: "POST",
      path: `/review/${fixtures.inReviewRevisionId}`,
      form: { intent: "none" },
      expect: only(["editor", "admin"], 400, 403, 302),
    },
  ],
  "/api/review/queue": [
    { path: "/api/review/queue", expect: only(["editor", "admin"], 200, 403, 401) },
    { method: "POST", path: "/api/review/queue", json: {}, expect: all(405) },
  ],
  "/api/review/:revisionId": [
    { path: `/api/review/${fixtures.inReviewRevisionId}`, expect: only(["editor", "admin"], 200, 403, 401) },
    {
      method: "POST",
      path: `/api/review/${fixtures.inReviewRevisionId}`,
      json: {},
      expect: only(["editor", "admin"], 400, 403, 401),
    },
  ],
  "/me/checklists": [
    { path: "/me/checklists", expect: signedIn(200, 302) },
    // No guide named: 400, and the page that would show it sends an anonymous visitor to sign in.
    { method: "POST", path: "/me/checklists", form: { intent: "none" }, expect: signedIn(400, 302) },
  ],
  "/me/checklists/:id": [
    { path: checklistPage(), expect: ownerOnly(200, 302) },
    { method: "POST", path: checklistPage(), form: { intent: "none" }, expect: ownerOnly(400, 302) },
  ],
  "/me/checklists/:id/csv": [{ path: checklistPage("/csv"), expect: ownerOnly(200, 302) }],
  "/api/checklists": [
    { path: "/api/checklists", expect: signedIn(200, 401) },
    { method: "POST", path: "/api/checklists", json: {}, expect: signedIn(400, 401) },
  ],
  "/api/checklists/:id": [
    { path: checklistPath(), expect: ownerOnly(200, 401) },
    { path: checklistPath(".csv"), expect: ownerOnly(200, 401) },
    { method: "PUT", path: checklistPath(), json: {}, expect: all(405) },
  ],
  "/api/checklists/:id/merge": [{ method: "POST", path: checklistPath("/merge"), expect: ownerOnly(200, 401) }],
  "/api/checklists/:id/items": [
    { path: checklistPath("/items"), expect: ownerOnly(200, 401) },
    { method: "POST", path: checklistPath("/items"), json: {}, expect: ownerOnly(400, 401) },
  ],
  "/api/checklists/:id/items/:itemId": [
    { method: "PATCH", path: checklistItemPath(), json: { checked: true }, expect: ownerOnly(200, 401) },
    // A guide's own item is ticked off, never deleted.
    { method: "DELETE", path: checklistItemPath(), expect: ownerOnly(409, 401) },
  ],
  "/api/openapi.json": [
    { path: "/api/openapi.json", expect: all(200) },
    { method: "POST", path: "/api/openapi.json", json: {}, expect: all(405) },
  ],
  "/api/docs": [
    { path: "/api/docs", expect: all(200) },
    { method: "POST", path: "/api/docs", json: {}, expect: all(405) },
  ],
  "/api/*": [
    { path: "/api/no-such-endpoint", expect: all(404) },
    { method: "POST", path: "/api/no-such-endpoint", json: {}, expect: all(404) },
  ],
  "/*": [{ path: "/no-such-page", expect: all(404) }],
};

/**
 * Routes that take writes from other sites on purpose, and why (docs/decisions/0006-mail-outbox.md).
 * Mail clients post RFC 8058 one-click opt-outs from their own servers and pages.
 */
const CROSS_SITE_EXCEPTIONS: Record<string, string> = {
  "/mail/opt-out/:token": "a mail's one-click opt-out, authorised by its signed token",
};

const sessions = new Map<Who, string | null>();

beforeAll(async () => {
  sessions.set("anonymous", null);
  for (const who of WHO) if (who !== "anonymous") sessions.set(who, await signInOverHttp(origin, ACCOUNTS[who]));
  const guide = (await (await fetch(`${origin}/api/guides/${fixtures.publishedSlug}`)).json()) as {
    steps: { photos: { variants: { url: string }[] }[] }[];
  };
  const url = guide.steps.flatMap((s) => s.photos)[0].variants[0].url;
  const saved = await fetch(`${origin}/api/checklists`, {
    method: "POST",
    headers: { origin, cookie: sessions.get("reader") ?? "", "content-type": "application/json" },
    body: JSON.stringify({ guideSlug: fixtures.publishedSlug }),
  });
  const checklist = (await saved.json()) as { id: number; items: { id: number }[] };
  if (saved.status !== 201 && saved.status !== 200) throw new Error(`the reader's checklist was not saved: ${saved.status}`);
  fixtures.checklistId = checklist.id;
  fixtures.itemId = checklist.items[0].id;
  fixtures.photo = new URL(url, origin).pathname;
  // The guide ids above are the seed's order: check they still name the guides the rows mean.
  const own = await fetch(`${origin}/api/guides/${fixtures.ownGuideId}/draft`, {
    headers: { cookie: sessions.get("authorOwn") ?? "" },
  });
  const view = (await own.json()) as { guide?: { slug: string; state: string } };
  if (view.guide?.slug !== "fjell-f3-hardwired-dash-camera" || view.guide.state !== "draft") {
    throw new Error(`guide ${fixtures.ownGuideId} is not the demo author's draft: ${JSON.stringify(view).slice(0, 200)}`);
  }
  const review = await fetch(`${origin}/api/review/${fixtures.inReviewRevisionId}`, {
    headers: { cookie: sessions.get("editor") ?? "" },
  });
  const desk = (await review.json()) as { revision?: { state: string; guide: { slug: string } } };
  if (desk.revision?.guide.slug !== fixtures.unpublishedSlug || desk.revision.state !== "in-review") {
    throw new Error(
      `revision ${fixtures.inReviewRevisionId} is not the demo revision in review: ${JSON.stringify(desk).slice(0, 200)}`,
    );
  }
});

describe("authorization matrix", () => {
  it("has exactly one row for every route in app/routes.ts", () => {
    const routes = new Set(routePatterns());
    const rows = new Set(Object.keys(MATRIX));
    expect(
      [...routes].filter((r) => !rows.has(r)),
      "routes without a row in the matrix",
    ).toEqual([]);
    expect(
      [...rows].filter((r) => !routes.has(r)),
      "rows for routes that no longer exist",
    ).toEqual([]);
  });

  it("answers every caller with the expected status", async () => {
    const mismatches: string[] = [];
    for (const [pattern, probes] of Object.entries(MATRIX)) {
      for (const probe of probes) {
        for (const who of WHO) {
          const account = who === "anonymous" ? null : ACCOUNTS[who];
          const cookie = probe.freshSession && account ? await signInOverHttp(origin, account) : (sessions.get(who) ?? null);
          const status = await call(origin, probe, who, cookie);
          if (status !== probe.expect[who]) {
            mismatches.push(`${pattern}: ${probe.method ?? "GET"} as ${who} → ${status}, expected ${probe.expect[who]}`);
          }
        }
      }
    }
    expect(mismatches).toEqual([]);
  });

  it("refuses a cross-site POST to every route with 403, before any action runs", async () => {
    const refused: string[] = [];
    for (const [pattern, probes] of Object.entries(MATRIX)) {
      if (pattern in CROSS_SITE_EXCEPTIONS) continue;
      const probe = probes[0];
      const path = typeof probe.path === "function" ? probe.path("reader") : probe.path;
      const response = await fetch(`${origin}${path}`, {
        method: "POST",
        headers: { origin: "http://evil.example", cookie: sessions.get("admin") ?? "" },
        redirect: "manual",
      });
      if (response.status !== 403) refused.push(`${pattern}: ${response.status}`);
    }
    expect(refused, "routes that accepted a cross-site POST").toEqual([]);
  });

  it("lets a cross-site POST through only where a signed token, not a session, authorises it", async () => {
    // The mail's one-click opt-out: an unsigned token is still refused, by the route (400).
    const response = await fetch(`${origin}/mail/opt-out/${badToken}`, {
      method: "POST",
      headers: { origin: "http://evil.example", "content-type": "application/x-www-form-urlencoded" },
      body: "List-Unsubscribe=One-Click",
      redirect: "manual",
    });
    expect(response.status).toBe(400);
    // Other addresses below /mail are not part of the exception.
    const beside = await fetch(`${origin}/mail/opt-out/${badToken}/more`, {
      method: "POST",
      headers: { origin: "http://evil.example" },
      redirect: "manual",
    });
    expect(beside.status).toBe(403);
  });
});

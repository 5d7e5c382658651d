import { describe, expect, it } from "vitest";
import { sharedApp } from "../support/shared-app";

/**
 * A guide page names its one address (a canonical link, RFC 6596) and describes itself for link
 * previews with Open Graph properties (the Open Graph protocol, ogp.me: og:title, og:type, og:url,
 * og:image; og:type "article"). Every address is absolute and built from the configured public
 * origin (APP_ORIGIN), over real HTTP on the shared app server.
 */
const { origin, client } = sharedApp("guide-page-meta");
const SLUG = "kestrel-hood-auxiliary-lamps";

const decode = (s: string) =>
  s
    .replace(/&#x27;/g, "'")
    .replace(/&quot;/g, '"')
    .replace(/&lt;/g, "<")
    .replace(/&gt;/g, ">")
    .replace(/&amp;/g, "&");

/** The head's `<meta property|name=… content=…>` and `<link rel=… href=…>` values, as React renders them. */
function headOf(html: string) {
  const head = html.slice(0, html.indexOf("</head>"));
  const meta = new Map<string, string[]>();
  for (const [, key, content] of head.matchAll(/<meta (?:property|name)="([^"]+)" content="([^"]*)"\/?>/g)) {
    meta.set(key, [...(meta.get(key) ?? []), decode(content)]);
  }
  const links = [...head.matchAll(/<link rel="([^"]+)" href="([^"]*)"\/?>/g)].map(([, rel, href]) => ({
    rel,
    href: decode(href),
  }));
  const title = /<title>([^<]*)<\/title>/.exec(head)?.[1];
  return { meta, links, title: title ? decode(title) : undefined };
}

async function page(path: string) {
  const response = await client().get(path);
  expect(response.status).toBe(200);
  return headOf(await response.text());
}

async function guideJson() {
  const response = await client().get(`/api/guides/${SLUG}`);
  expect(response.status).toBe(200);
  // GET /api/guides/:slug (shared/design/api.md): the published revision, title and summary included.
  return (await response.json()) as { title: string; summary: string };
}

describe("a guide page's canonical link and Open Graph tags", () => {
  it("carries the guide's own absolute address, title, summary and type", async () => {
    const guide = await guideJson();
    const head = await page(`/guides/${SLUG}`);
    const url = `${origin}/guides/${SLUG}`;
    expect(head.links.filter((l) => l.rel === "canonical")).toEqual([{ rel: "canonical", href: url }]);
    expect(head.meta.get("og:url")).toEqual([url]);
    expect(head.meta.get("og:type")).toEqual(["article"]);
    expect(head.meta.get("og:title")).toEqual([guide.title]);
    expect(head.meta.get("og:description")).toEqual([guide.summary]);
    expect(head.meta.get("description")).toEqual([guide.summary]);
    expect(head.title).toBe(`${guide.title} · Torqueleaf`);
  });

  it("points og:image at one of the guide's photos, by an absolute address that serves a JPEG", async () => {
    const head = await page(`/guides/${SLUG}`);
    const [image] = head.meta.get("og:image") ?? [];
    expect(image).toMatch(new RegExp(`^${origin.replace(/[.]/g, "\\.")}/media/.+\\.jpg$`));
    expect(Number(head.meta.get("og:image:width")?.[0])).toBeGreaterThan(0);
    expect(Number(head.meta.get("og:image:height")?.[0])).toBeGreaterThan(0);
    expect(head.meta.get("og:image:alt")?.[0]).toBeTruthy();
    const photo = await client().get(image);
    expect(photo.status).toBe(200);
    expect(photo.headers.get("content-type")).toMatch(/^image\/jpeg/);
  });

  it("dates the article and names its section and the image's type (ogp.me: article:*, og:image:type)", async () => {
    const head = await page(`/guides/${SLUG}`);
    expect(head.meta.get("og:image:type")).toEqual(["image/jpeg"]);
    const [published] = head.meta.get("article:published_time") ?? [];
    const [modified] = head.meta.get("article:modified_time") ?? [];
    // ISO 8601 date-times, as the Open Graph protocol's DateTime type asks.
    for (const value of [published, modified]) expect(value).toMatch(/^\d{4}-\d{2}-\d{2}T\d{2}:\d{2}:\d{2}(\.\d+)?Z$/);
    expect(Date.parse(modified)).toBeGreaterThanOrEqual(Date.parse(published));
    // The demo guide is in the lighting category (content-samples/guides/kestrel-hood-auxiliary-lamps.ts).
    expect(head.meta.get("article:section")).toEqual(["Lighting"]);
  });

  it("names the guide page, not the print view, as canonical on the print view", async () => {
    const head = await page(`/guides/${SLUG}?print=1`);
    expect(head.links.filter((l) => l.rel === "canonical").map((l) => l.href)).toEqual([`${origin}/guides/${SLUG}`]);
    expect(head.meta.get("og:url")).toEqual([`${origin}/guides/${SLUG}`]);
  });

  it("builds the addresses from the configured origin, whatever address the request came to", async () => {
    // The same server reached by its IP address instead of the configured host name (or the other way round).
    const other = origin.includes("localhost")
      ? origin.replace("localhost", "127.0.0.1")
      : origin.replace("127.0.0.1", "localhost");
    const response = await client().get(`${other}/guides/${SLUG}`);
    expect(response.status).toBe(200);
    const head = headOf(await response.text());
    expect(head.meta.get("og:url")).toEqual([`${origin}/guides/${SLUG}`]);
    expect(head.links.find((l) => l.rel === "canonical")?.href).toBe(`${origin}/guides/${SLUG}`);
  });

  it("puts no Open Graph tags on a guide that does not exist", async () => {
    const response = await client().get("/guides/no-such-guide");
    expect(response.status).toBe(404);
    const head = headOf(await response.text());
    expect(head.meta.has("og:url")).toBe(false);
    expect(head.links.some((l) => l.rel === "canonical")).toBe(false);
  });
});

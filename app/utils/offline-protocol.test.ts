import { describe, expect, it } from "vitest";
import { KEEPABLE_PAGE, keptVariant, pagesCacheName, QUEUED_CHANGES } from "./offline-protocol";

const queued = (method: string, path: string) => QUEUED_CHANGES.some((c) => c.method === method && c.path.test(path));

describe("what the service worker queues without signal", () => {
  it("queues step ticks and checklist item changes (design/api.md: PATCH /api/checklists/:id/items/:itemId)", () => {
    expect(queued("PUT", "/api/guides/kestrel-hood-auxiliary-lamps/step-ticks")).toBe(true);
    expect(queued("PATCH", "/api/checklists/12/items/40")).toBe(true);
  });

  it("queues nothing else: not reads, not other writes, not a checklist's deletion or new items", () => {
    expect(queued("GET", "/api/guides/kestrel-hood-auxiliary-lamps/step-ticks")).toBe(false);
    expect(queued("PUT", "/api/guides/7/draft")).toBe(false);
    expect(queued("DELETE", "/api/checklists/12/items/40")).toBe(false);
    expect(queued("POST", "/api/checklists/12/items")).toBe(false);
    expect(queued("PATCH", "/api/checklists/12/items/40/extra")).toBe(false);
  });
});

describe("what can be kept", () => {
  it("keeps a guide page by its address, not its data file, print view or another page", () => {
    expect(KEEPABLE_PAGE.test("/guides/kestrel-hood-auxiliary-lamps")).toBe(true);
    expect(KEEPABLE_PAGE.test("/guides/kestrel-hood-auxiliary-lamps.data")).toBe(false);
    expect(KEEPABLE_PAGE.test("/guides/a/b")).toBe(false);
    expect(KEEPABLE_PAGE.test("/me/checklists")).toBe(false);
  });

  it("keeps pages in a cache per reader, and one for readers who are not signed in", () => {
    expect(pagesCacheName(12)).toBe("tl-pages-u12");
    expect(pagesCacheName(null)).toBe("tl-pages-anon");
    expect(pagesCacheName(1)).not.toBe(pagesCacheName(12));
  });

  it("keeps one width of each photo: the smallest WebP at least 720 px wide, else the widest", () => {
    // The widths the image pipeline writes (480, 960, 1600; see the authoring API test), in WebP and JPEG.
    const variants = [480, 960, 1600].flatMap((width) =>
      ["webp", "jpeg"].map((format) => ({ width, format, url: `/media/photos/p/${width}.${format}` })),
    );
    expect(keptVariant(variants)?.url).toBe("/media/photos/p/960.webp");
    expect(keptVariant(variants.filter((v) => v.width === 480))?.url).toBe("/media/photos/p/480.webp");
    expect(keptVariant(variants.filter((v) => v.format === "jpeg"))?.url).toBe("/media/photos/p/960.jpeg");
    expect(keptVariant([])).toBeUndefined();
  });
});

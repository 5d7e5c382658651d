import { beforeAll, describe, expect, it } from "vitest";
import type { TestClient } from "../support/http-client";
import { sharedApp } from "../support/shared-app";

// The Library page and robots.txt over real HTTP, through the shared app server.
let client: TestClient;

beforeAll(() => {
  client = sharedApp("library-page").client();
});

const text = async (res: Response) => (await res.text()).replace(/<!-- -->/g, "");

describe("the Library page", () => {
  it("sends an address with empty parameters on to the same address without them", async () => {
    const res = await client.get("/?q=&vehicle=&year=&powertrain=hybrid&drivetrain=&category=&difficulty=");
    expect(res.status).toBe(302);
    expect(res.headers.get("location")).toBe("/?powertrain=hybrid");
    const empty = await client.get("/?q=&year=%20");
    expect(empty.status).toBe(302);
    expect(empty.headers.get("location")).toBe("/");
    // An address with nothing empty in it is answered as it is.
    expect((await client.get("/?powertrain=hybrid")).status).toBe(200);
  });

  it("says a page is past the end and links to the last one", async () => {
    const res = await client.get("/?powertrain=hybrid&page=7");
    expect(res.status).toBe(200);
    const html = await text(res);
    expect(html).toMatch(/Page 7 is past the end of this list: it has 1 page\./);
    expect(html).toMatch(/<a[^>]*href="\/\?powertrain=hybrid"[^>]*>Go to page 1, the last one<\/a>/);
  });

  it("names the model year field and the catalogue's years when a year is outside them", async () => {
    const html = await text(await client.get("/?year=2090"));
    expect(html).toMatch(/Model year 2090 is outside the catalogue: it lists vehicles from 2013 to \d{4}\./);
    // The year stays in its box, marked, for the reader to correct.
    const input = html.match(/<input[^>]*id="year"[^>]*>/)?.[0] ?? "";
    expect(input).toContain('value="2090"');
    expect(input).toContain('aria-invalid="true"');
    expect(input).toContain('aria-describedby="problem-year"');
  });

  it("answers every hostile search with a page, never a server error", async () => {
    for (const q of ['"', "NEAR(a b)", "*", "((relay", "x".repeat(10 * 1024), '" OR 1=1 --']) {
      const res = await client.get(`/?q=${encodeURIComponent(q)}`);
      expect(res.status, q.slice(0, 20)).toBe(200);
      await res.arrayBuffer();
    }
  });

  it("shows facet counts in words, never a bare 0", async () => {
    const html = await text(await client.get("/"));
    // No demo guide in the electronics category is published (the dash camera is a draft).
    expect(html).toMatch(/Electronics<\/span><span[^>]*>no guides<\/span>/);
  });
});

describe("robots.txt", () => {
  it("lets crawlers read the guides and keeps them out of accounts, authoring, review, admin and the API", async () => {
    const res = await client.get("/robots.txt");
    expect(res.status).toBe(200);
    const body = await res.text();
    // The directives of RFC 9309 (Robots Exclusion Protocol) §2.2.
    expect(body).toMatch(/^User-agent: \*$/m);
    expect(body).toMatch(/^Allow: \/$/m);
    for (const path of ["/api/", "/me/", "/admin/", "/workbench/", "/review/", "/dev/", "/auth/"]) {
      expect(body).toMatch(new RegExp(`^Disallow: ${path.replace(/\//g, "\\/")}$`, "m"));
    }
  });
});

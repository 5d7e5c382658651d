import { connect } from "node:net";
import { createClient } from "@libsql/client";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { TestClient } from "../support/http-client";
import { type BuiltApp, ensureBuild, sharedServices, startBuiltApp } from "./built-app";

/**
 * What readers who are not signed in get from the built app (`npm start`'s server) on a copy of the
 * demo database: pages and API answers a browser or a shared cache may keep and check again
 * (RFC 9110 §8.8.3 ETag, §13.1.2 If-None-Match, §15.4.5 304; RFC 9111 §5.2 Cache-Control, RFC 5861
 * stale-while-revalidate), a fresh CSP nonce on every page (CSP Level 3 §2.3.1) though the page is
 * rendered once, and every change to the content seen at once, whoever wrote it.
 */
const SLUG = "kestrel-hood-auxiliary-lamps";
const GUIDE = `/guides/${SLUG}`;
const DEMO_PASSWORD = "torqueleaf-demo";

let app: BuiltApp;
let client: TestClient;

beforeAll(async () => {
  await ensureBuild();
  app = await startBuiltApp(
    {
      ...sharedServices(),
      NODE_ENV: "production",
      SESSION_SECRET: "reader-caching-secret-0123456789abcdef",
      LOCAL_FAKES: "0",
      DEMO_DATA: "0",
    },
    { database: "demo", args: ["--local-demo"] },
  );
  client = new TestClient(`http://localhost:${app.port}`);
}, 240_000);
afterAll(() => app?.stop());

/** Writes to the app's database from another connection, as a second process or an admin's tool would. */
async function writeBehindTheApp(statement: string, args: (string | number)[] = []) {
  const db = createClient({ url: `file:${app.database}` });
  try {
    await db.execute({ sql: statement, args });
  } finally {
    db.close();
  }
}

const headersOf304 = (response: Response) =>
  [...response.headers].filter(([name]) => !["date", "keep-alive", "connection"].includes(name)).sort();

const nonceOf = (response: Response) => /'nonce-([^']+)'/.exec(response.headers.get("content-security-policy") ?? "")?.[1];

describe("a page for a reader who is not signed in", () => {
  it("may be kept (public, with an ETag and Vary: Cookie) and is answered 304 when the ETag is named", async () => {
    const first = await client.get(GUIDE);
    expect(first.status).toBe(200);
    const etag = first.headers.get("etag") ?? "";
    expect(etag).toMatch(/^W\/"[\w-]+"$/);
    expect(first.headers.get("cache-control")).toMatch(/\bpublic\b.*\bmax-age=\d+.*\bstale-while-revalidate=\d+/);
    expect(first.headers.get("vary") ?? "").toMatch(/\bCookie\b/i);

    const again = await client.get(GUIDE, { headers: { "if-none-match": etag } });
    expect(again.status).toBe(304);
    expect(await again.text()).toBe("");
    expect(again.headers.get("etag")).toBe(etag);
    // The browser keeps the page it has with that page's policy; a new nonce would block its scripts.
    expect(again.headers.get("content-security-policy")).toBeNull();

    const other = await client.get(GUIDE, { headers: { "if-none-match": 'W/"something-else"' } });
    expect(other.status).toBe(200);
  });

  it("carries a fresh nonce on every answer, in its policy and on its scripts, though rendered once", async () => {
    const [a, b] = [await client.get(GUIDE), await client.get(GUIDE)];
    const [htmlA, htmlB] = [await a.text(), await b.text()];
    const [nonceA, nonceB] = [nonceOf(a), nonceOf(b)];
    expect(nonceA && nonceB && nonceA !== nonceB).toBe(true);
    expect(htmlA).toContain(`nonce="${nonceA}"`);
    expect(htmlA).not.toContain(`nonce="${nonceB}"`);
    expect(htmlB).toContain(`nonce="${nonceB}"`);
    // Every script carries the answer's own nonce, none the one kept with the markup.
    const scripts = [...htmlB.matchAll(/<script\b[^>]*>/g)].map(([tag]) => tag);
    expect(scripts.length).toBeGreaterThan(0);
    for (const tag of scripts) expect(tag.includes(`nonce="${nonceB}"`) || / src="/.test(tag)).toBe(true);
    expect(a.headers.get("etag")).toBe(b.headers.get("etag"));
  });

  it("is answered alike every time (the page as it was kept, before React Router runs): headers and markup differ by the nonce only", async () => {
    const answers = [];
    for (const path of [GUIDE, GUIDE, GUIDE, "/", "/", "/?category=lighting", "/?category=lighting"]) {
      const response = await client.get(path);
      const nonce = nonceOf(response) ?? "no nonce";
      const headers = [...response.headers]
        .filter(([name]) => name !== "date" && name !== "keep-alive" && name !== "connection")
        .map(([name, value]) => `${name}: ${value.replaceAll(nonce, "NONCE")}`)
        .sort();
      answers.push({ path, headers, body: (await response.text()).replaceAll(nonce, "NONCE") });
    }
    for (const [a, b] of [
      [0, 1],
      [1, 2],
      [3, 4],
      [5, 6],
    ] as const) {
      expect(answers[b].headers).toEqual(answers[a].headers);
      expect(answers[b].body).toBe(answers[a].body);
    }
    expect(answers[3].body).not.toBe(answers[5].body);
  });

  it("carries each step's text once: in the markup, not again in the data for hydration", async () => {
    const api = (await (await client.get(`/api/guides/${SLUG}`)).json()) as { steps: { html: string }[] };
    const text = api.steps.map((s) => s.html.replace(/<[^>]+>/g, " ")).join(" ");
    const phrase = /[A-Za-z][A-Za-z ]{30,}/.exec(text)?.[0].trim().slice(0, 30) ?? "";
    expect(phrase.length).toBe(30);
    const html = await (await client.get(GUIDE)).text();
    expect(html.split(phrase).length - 1).toBe(1);
    // A navigation in the browser gets the text in the data, since it has no markup yet.
    const data = await (await client.get(`${GUIDE}.data`)).text();
    expect(data).toContain(phrase);
  });

  it("carries the guide's data once: in a data block the browser does not run, not in the hand-off script", async () => {
    const api = (await (await client.get(`/api/guides/${SLUG}`)).json()) as { title: string; parts: { name: string }[] };
    const part = api.parts[0]?.name ?? "";
    expect(part.length).toBeGreaterThan(3);
    const html = await (await client.get(GUIDE)).text();
    const block = /<script type="application\/json" id="guide-data"[^>]*>([\s\S]*?)<\/script>/.exec(html)?.[1] ?? "";
    // No "<" in the block: nothing in it can end the element early (HTML Living Standard §4.12.1.3).
    expect(block).not.toContain("<");
    const guide = JSON.parse(block) as { title: string; parts: { name: string }[] };
    expect(guide.title).toBe(api.title);
    expect(guide.parts.map((p) => p.name)).toEqual(api.parts.map((p) => p.name));
    const handOff = [...html.matchAll(/<script[^>]*>([\s\S]*?)<\/script>/g)]
      .map((m) => m[1])
      .filter((body) => body.includes("__reactRouterContext"))
      .join("\n");
    expect(handOff.length).toBeGreaterThan(0);
    expect(handOff).not.toContain(part);
  });
});

describe("the Library page", () => {
  it("carries its data once, as a data block, and a navigation's data carries it instead", async () => {
    const api = (await (await client.get("/api/guides")).json()) as { guides: { slug: string; title: string }[] };
    const html = await (await client.get("/")).text();
    const block = /<script type="application\/json" id="library-data"[^>]*>([\s\S]*?)<\/script>/.exec(html)?.[1] ?? "";
    expect(block).not.toContain("<");
    const page = JSON.parse(block) as { guides: { slug: string; title: string }[] };
    expect(page.guides.map((g) => g.slug)).toEqual(api.guides.map((g) => g.slug));
    // React Router's data for a navigation to the index route (its `_root.data` address).
    const data = await (await client.get("/_root.data")).text();
    expect(data).toContain(api.guides[0]?.slug ?? "no guide");
  });
});

describe("a page that is not a reader page", () => {
  it.each([["/login"], ["/signup"], ["/reset"]])("%s carries no ETag and is not public", async (path) => {
    const page = await client.get(path);
    expect(page.status).toBe(200);
    expect(page.headers.get("etag")).toBeNull();
    expect(page.headers.get("cache-control") ?? "").not.toMatch(/\bpublic\b/);
  });
});

describe("a page for a signed-in member", () => {
  it("is private and never stored, and carries no ETag", async () => {
    const member = new TestClient(`http://localhost:${app.port}`);
    expect((await member.signIn("reader@torqueleaf.test", DEMO_PASSWORD)).status).toBe(302);
    const page = await member.get(GUIDE);
    expect(page.status).toBe(200);
    expect(page.headers.get("cache-control")).toBe("private, no-store");
    expect(page.headers.get("etag")).toBeNull();
  });
});

describe("answers of the public API", () => {
  it("are answered alike every time (the answer as it was noted, before Express runs): the same headers and content, in each encoding", async () => {
    // Addresses nothing above asked for: each first answer comes through React Router, the next from the note.
    // Content codings: RFC 9110 §8.4.1 and §12.5.3 (br is RFC 7932); undefined is fetch's own header.
    const cases: [string, string | undefined][] = [
      ["/api/guides?difficulty=2", undefined],
      ["/api/guides?difficulty=1", "identity"],
      ["/api/guides?difficulty=3", "br"],
      ["/api/guides/kestrel-rear-recovery-points", "gzip"],
      ["/api/catalogue", undefined],
    ];
    // Framing differs by path (a streamed answer is chunked), not what the answer says.
    const framing = ["date", "keep-alive", "connection", "content-length", "transfer-encoding", "content-security-policy"];
    const headersOf = (response: Response) => [...response.headers].filter(([name]) => !framing.includes(name)).sort();
    for (const [path, encoding] of cases) {
      const init = encoding ? { headers: { "accept-encoding": encoding } } : undefined;
      const [a, b] = [await client.get(path, init), await client.get(path, init)];
      expect(a.status).toBe(200);
      expect(headersOf(b)).toEqual(headersOf(a));
      expect(a.headers.get("content-type")).toBe("application/json; charset=utf-8");
      if (encoding && encoding !== "identity") expect(b.headers.get("content-encoding")).toBe(encoding);
      if (encoding === "identity") expect(b.headers.get("content-encoding")).toBeNull();
      expect(await b.text()).toBe(await a.text());
      // Every answer has a policy of its own (CSP Level 3 §2.3.1), the noted ones included.
      const [policyA, policyB] = [a.headers.get("content-security-policy"), b.headers.get("content-security-policy")];
      expect(policyB?.replaceAll(/'nonce-[^']+'/g, "")).toBe(policyA?.replaceAll(/'nonce-[^']+'/g, ""));
      expect(nonceOf(b)).not.toBe(nonceOf(a));
    }
  });

  it("a noted answer named by its ETag is 304, with the same headers as React Router's 304", async () => {
    const path = "/api/guides?difficulty=4";
    const etag = (await client.get(path)).headers.get("etag") ?? "";
    // The first 304 for a new address: "?difficulty=4&" asks the same, and nothing is noted for it yet.
    const [routed, noted] = [
      await client.get(`${path}&`, { headers: { "if-none-match": etag } }),
      await client.get(path, { headers: { "if-none-match": etag } }),
    ];
    expect([routed.status, noted.status]).toEqual([304, 304]);
    expect(headersOf304(noted)).toEqual(headersOf304(routed));
    expect(noted.headers.get("content-security-policy")).toBeNull();
  });

  it.each([["/api/guides"], [`/api/guides/${SLUG}`], ["/api/catalogue"]])(
    "%s may be kept and is answered 304 for its ETag",
    async (path) => {
      const first = await client.get(path);
      expect(first.status).toBe(200);
      const etag = first.headers.get("etag") ?? "";
      expect(etag).toMatch(/^W\/"[\w-]+"$/);
      expect(first.headers.get("cache-control")).toMatch(/\bpublic\b/);
      const again = await client.get(path, { headers: { "if-none-match": etag } });
      expect(again.status).toBe(304);
      expect(await again.text()).toBe("");
    },
  );
});

describe("a change to the content", () => {
  it("shows at once on the guide page and in the API: an author's new name, a vehicle renamed in the catalogue", async () => {
    const before = await client.get(GUIDE);
    const etag = before.headers.get("etag");
    await before.text();
    await writeBehindTheApp(
      "UPDATE users SET name = 'Renamed Author Ostrava' WHERE id = (SELECT author_id FROM guides WHERE slug = ?)",
      [SLUG],
    );
    const renamed = await client.get(GUIDE);
    expect(await renamed.text()).toContain("Renamed Author Ostrava");
    expect(renamed.headers.get("etag")).not.toBe(etag);

    await writeBehindTheApp(
      `UPDATE variants SET name = name || ' Renamedtrim' WHERE id = (
         SELECT f.variant_id FROM fitment f JOIN guides g ON g.published_revision_id = f.revision_id
         WHERE g.slug = ? ORDER BY f.variant_id LIMIT 1)`,
      [SLUG],
    );
    expect(await (await client.get(GUIDE)).text()).toContain("Renamedtrim");
    expect(JSON.stringify(await (await client.get(`/api/guides/${SLUG}`)).json())).toContain("Renamedtrim");
    expect(JSON.stringify(await (await client.get("/api/catalogue")).json())).toContain("Renamedtrim");
  });

  it("shows at once on the guide page and in the API: an author's new bio, a reader's report written and hidden", async () => {
    await writeBehindTheApp(
      "UPDATE users SET bio = 'Rebuilt bio Vaduz' WHERE id = (SELECT author_id FROM guides WHERE slug = ?)",
      [SLUG],
    );
    expect(await (await client.get(GUIDE)).text()).toContain("Rebuilt bio Vaduz");

    const tally = async () =>
      (
        (await (await client.get(`/api/guides/${SLUG}`)).json()) as { fitmentReports: { doesNotFit: number }[] }
      ).fitmentReports.reduce((n, t) => n + t.doesNotFit, 0);
    const before = await tally();
    await writeBehindTheApp(
      `INSERT INTO fitment_reports (guide_id, variant_id, user_id, status, note, created_at, updated_at)
       SELECT g.id, f.variant_id, (SELECT id FROM users WHERE email = 'editor@torqueleaf.test'), 'does-not-fit',
         'Bracket clashed Quillmark', 1796300000000, 1796300000000
       FROM guides g JOIN fitment f ON f.revision_id = g.published_revision_id WHERE g.slug = ? ORDER BY f.variant_id LIMIT 1`,
      [SLUG],
    );
    expect(await (await client.get(GUIDE)).text()).toContain("Bracket clashed Quillmark");
    expect(await tally()).toBe(before + 1);

    await writeBehindTheApp("UPDATE fitment_reports SET hidden_at = 1796300001000, hidden_reason = 'test' WHERE note = ?", [
      "Bracket clashed Quillmark",
    ]);
    expect(await (await client.get(GUIDE)).text()).not.toContain("Bracket clashed Quillmark");
    expect(await tally()).toBe(before);
  });

  it("shows at once in the Library", async () => {
    const listed = async () =>
      ((await (await client.get("/api/guides?q=lamps")).json()) as { guides: { title: string }[] }).guides;
    expect((await listed()).some((g) => g.title.includes("Newly titled"))).toBe(false);
    await writeBehindTheApp("UPDATE guides SET title = 'Newly titled hood lamps' WHERE slug = ?", [SLUG]);
    expect((await listed()).some((g) => g.title === "Newly titled hood lamps")).toBe(true);
    expect(await (await client.get("/")).text()).toContain("Newly titled hood lamps");
  });
});

describe("request targets that are not a plain path", () => {
  /** One raw HTTP/1.1 request, as a client that sends its target unparsed would (RFC 9112 §3.2). */
  function rawStatus(target: string): Promise<number> {
    return new Promise((resolve, reject) => {
      const socket = connect(app.port, "127.0.0.1", () => {
        socket.write(`GET ${target} HTTP/1.1\r\nHost: localhost:${app.port}\r\nConnection: close\r\n\r\n`);
      });
      let head = "";
      socket.on("data", (chunk) => {
        head += chunk.toString("latin1");
      });
      socket.on("end", () => resolve(Number(/^HTTP\/1\.1 (\d{3})/.exec(head)?.[1] ?? 0)));
      socket.on("error", reject);
    });
  }

  it("never fail the server: each gets an answer below 500", async () => {
    await client.get("/api/guides");
    for (const target of [
      "/\\[",
      "/\\\\evil/api/guides",
      "//api/guides",
      "http://[/api/guides",
      "/api/guides?%",
      "*",
      "localhost:1",
    ]) {
      const status = await rawStatus(target);
      expect(status, target).toBeGreaterThanOrEqual(200);
      expect(status, target).toBeLessThan(500);
    }
  });

  it("an absolute form is read as its path (RFC 9112 §3.2.2); the asterisk form is refused (§3.2.4: OPTIONS only)", async () => {
    expect(await rawStatus(`http://localhost:${app.port}/api/guides`)).toBe(200);
    expect(await rawStatus(`http://localhost:${app.port}/guides/${SLUG}`)).toBe(200);
    expect(await rawStatus("*")).toBe(400);
  });
});

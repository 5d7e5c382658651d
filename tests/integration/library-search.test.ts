import fc from "fast-check";
import { beforeAll, describe, expect, it } from "vitest";
import type { Db } from "~/db/client.server";
import { listFromIndex } from "~/models/library-index.server";
import { listPublishedGuides, markedHtml, parseLibraryQuery } from "~/models/library.server";
import type { TestClient } from "../support/http-client";
import { sharedApp } from "../support/shared-app";

/**
 * No search text can make the Library fail: FTS5 query syntax (SQLite's FTS5 documentation,
 * section 3 "Full-text Query Syntax": strings, `*` prefixes, `^`, NEAR groups, AND/OR/NOT, column
 * filters `col:` and `{a b}:`, parentheses), quotes left open, control characters, emoji, null
 * bytes and 10,000 characters, over the model functions and over real HTTP (the JSON API and the
 * page), each answered with a list (possibly empty), never an error.
 */
let db: Db;
let client: TestClient;

beforeAll(async () => {
  client = sharedApp("library-search").client();
  db = await (await import("~/db/client.server")).getDb();
});

const SYNTAX = [
  '"',
  '""',
  '"""',
  "'",
  "*",
  "**",
  "relay*",
  "*relay",
  "^",
  "^relay",
  "NEAR(",
  "NEAR(relay",
  "NEAR(relay fuse, 2)",
  "NEAR(relay fuse, -1)",
  "NEAR()",
  "-",
  "--",
  "-relay",
  "relay -fuse",
  ":",
  "title:",
  "title:relay",
  "summary:lamp",
  "steps_text:harness",
  "nosuchcolumn:relay",
  "{title summary}:relay",
  "-{title}:relay",
  "{}:x",
  "AND",
  "OR",
  "NOT",
  "AND OR NOT",
  "relay AND",
  "OR relay",
  "NOT NOT",
  "relay NOT",
  "(",
  ")",
  "()",
  "((relay",
  "relay))",
  "(relay OR fuse",
  '"unbalanced',
  'unbalanced"',
  '"relay" "fuse',
  "'single",
  "\\",
  "\\\\",
  "%",
  "_",
  "%relay%",
  "+",
  "+relay",
  "relay + fuse",
  ",",
  ";",
  "; DROP TABLE guides; --",
  "' OR 1=1 --",
  '" OR 1=1 --',
  "rank:",
  "rowid:1",
  "bm25(",
  "MATCH",
  "guide_search",
  "\u0000",
  "relay\u0000fuse",
  "\u0000\u0000\u0000",
  "\u0001\u0002\u0003",
  "\u007f",
  "\t",
  "\n",
  "\r\n",
  " ",
  "\u00a0",
  "\u200b",
  "\ufeff",
  "\ue000relay\ue001",
  "\ue001",
  "\ud800",
  "\udfff",
  "🔧",
  "🔧🔩⚡",
  "relay 🔧 fuse",
  "👨‍👩‍👧",
  "🏳️‍🌈",
  "ﬁ",
  "Ｒｅｌａｙ",
  "relais élevé",
  "çàéïö",
  "straße",
  "İstanbul",
  "ℌ",
  "٣٤٥",
  "١٢ فولت",
  "継電器",
  "реле",
  "ρελέ",
  "עברית",
  "\u0301",
  "e\u0301",
  "<script>alert(1)</script>",
  "<mark>relay</mark>",
  "&amp;",
  "&lt;",
  "$" + "{relay}",
  "{{relay}}",
  "%00",
  "%22",
  "a".repeat(199),
  "a ".repeat(150),
  "relay ".repeat(40),
  "x".repeat(10_000),
  "NEAR(".repeat(2000),
  '"'.repeat(10_000),
  "*".repeat(10_000),
  "🔧".repeat(5000),
  "\u0000".repeat(10_000),
  "0",
  "-1",
  "1e308",
  "NaN",
  "12",
  "12v",
  "12 V",
  "M8",
  "10mm",
  "30A",
];

/** The syntax above, and each combined with a word that matches and with another syntax piece. */
const HOSTILE = [
  ...SYNTAX,
  ...SYNTAX.slice(0, 70).map((s) => `relay ${s}`),
  ...SYNTAX.slice(0, 40).map((s, i) => `${s}${SYNTAX[(i * 7 + 3) % SYNTAX.length]}`),
];

async function searchModel(q: string) {
  const query = parseLibraryQuery(new URLSearchParams({ q }));
  const served = await listFromIndex(db, query);
  expect(Array.isArray(served.guides)).toBe(true);
  expect(served.total).toBeGreaterThanOrEqual(0);
  // Every highlight is escaped text with <mark> around words only.
  for (const g of served.guides) {
    for (const html of [g.highlight?.title, g.highlight?.summary, g.highlight?.steps]) {
      if (html) expect(html.replace(/<\/?mark>/g, "")).not.toMatch(/[<>]/);
    }
  }
  return served;
}

describe("hostile search text", () => {
  it(`has at least 200 cases`, () => {
    expect(HOSTILE.length).toBeGreaterThanOrEqual(200);
  });

  it("answers each through the model functions, the index and the SQL alike", async () => {
    for (const q of HOSTILE) {
      const served = await searchModel(q);
      const query = parseLibraryQuery(new URLSearchParams({ q }));
      expect((await listPublishedGuides(db, query)).total, q.slice(0, 30)).toBe(served.total);
    }
    // A word of the demo guides (content-samples/guides) still finds them inside the noise.
    expect((await searchModel("relay ((NEAR(")).total).toBeGreaterThan(0);
  });

  it("answers each over HTTP with 200: the JSON API and the Library page", { timeout: 240_000 }, async () => {
    // A lone surrogate has no UTF-8 form (encodeURIComponent refuses it): it goes as the bytes a
    // careless client would send, with other malformed UTF-8 sequences (RFC 3629 §3: never valid).
    const encoded = [
      ...HOSTILE.map((q) =>
        q
          .split(/\p{Cs}/u)
          .map(encodeURIComponent)
          .join("%ED%A0%80"),
      ),
      "%ED%A0%80",
      "%FF%FE",
      "%C0%AF",
      "%E2%82",
      "relay%",
      "%%%",
    ];
    for (const [n, q] of encoded.entries()) {
      const api = await client.get(`/api/guides?q=${q}`);
      // Node's HTTP server refuses a request head over 16 KB (its --max-http-header-size default)
      // with 431 before the app sees it: a 10,000-character search of quotes, percent-encoded,
      // is 30 KB. A client error, never a server error; anything shorter reaches the app.
      if (q.length > 16_000) {
        expect(api.status, q.slice(0, 30)).toBe(431);
        await api.arrayBuffer();
        continue;
      }
      expect(api.status, q.slice(0, 30)).toBe(200);
      const body = (await api.json()) as { guides: unknown[] };
      expect(Array.isArray(body.guides)).toBe(true);
      // The page renders more per request: every second case is enough for it.
      if (n % 2 === 1) continue;
      const page = await client.get(`/?q=${q}`);
      // An all-blank search is sent on to the address without it.
      expect([200, 302], q.slice(0, 30)).toContain(page.status);
      await page.arrayBuffer();
    }
  });

  it("answers any string at all (fast-check over arbitrary code units)", { timeout: 120_000 }, async () => {
    await fc.assert(
      fc.asyncProperty(
        fc.string({ unit: "binary", maxLength: 300 }),
        fc.string({ unit: "grapheme", maxLength: 50 }),
        async (a, b) => {
          await searchModel(a);
          await searchModel(`${b} ${a}`);
        },
      ),
      { numRuns: 300 },
    );
    await fc.assert(
      fc.asyncProperty(fc.string({ unit: "binary-ascii", maxLength: 200 }), async (q) => {
        const res = await client.get(`/api/guides?q=${encodeURIComponent(q)}`);
        expect(res.status).toBe(200);
        await res.arrayBuffer();
      }),
      { numRuns: 100 },
    );
  });
});

describe("highlighting", () => {
  it("escapes every character HTML gives meaning to and marks only the matched runs", () => {
    // The five characters the HTML Standard's "escaping a string" and attribute contexts need.
    expect(markedHtml(`a<b>&"'`)).toBe("a&lt;b&gt;&amp;&quot;&#39;");
    expect(markedHtml("fit the \ue000relay\ue001 here")).toBe("fit the <mark>relay</mark> here");
    // Stray and unbalanced markers never open twice or leave a <mark> open.
    expect(markedHtml("\ue001x\ue000\ue000y")).toBe("x<mark>y</mark>");
    expect(markedHtml("a\u0000b")).toBe("ab");
    fc.assert(
      fc.property(fc.string({ unit: "binary", maxLength: 200 }), (text) => {
        const html = markedHtml(text);
        expect(html.replace(/<\/?mark>/g, "")).not.toMatch(/[<>"']/);
        const opens = html.match(/<mark>/g)?.length ?? 0;
        expect(html.match(/<\/mark>/g)?.length ?? 0).toBe(opens);
      }),
      { numRuns: 500 },
    );
  });

  it("marks the matched words of a demo guide's title, summary and steps", async () => {
    const answer = await searchModel("relay");
    const lamps = answer.guides.find((g) => g.slug === "kestrel-hood-auxiliary-lamps");
    expect(lamps?.highlight).toBeTruthy();
    const all = [lamps?.highlight?.title, lamps?.highlight?.summary, lamps?.highlight?.steps].join(" ");
    expect(all).toMatch(/<mark>relay/i);
  });
});

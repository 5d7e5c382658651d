import fc from "fast-check";
import { describe, expect, it } from "vitest";
import { parseJsonWithoutPoison } from "~/routes/authoring-api.server";
import { AppError } from "~/utils/errors";
import { BODY_MAX_BYTES, BODY_MAX_DEPTH, decodeEntities, linkProblem, renderBody } from "./richtext.server";

// Hostile step bodies. The link spellings follow the OWASP XSS Filter Evasion Cheat Sheet (mixed
// case, embedded tab / newline / NUL, character references with and without semicolons and
// leading zeros) and the WHATWG URL Standard's rule that leading C0 controls and spaces are
// stripped and tabs and newlines dropped before a scheme is read.

const text = (value: string, marks?: unknown[]) => ({ type: "text", text: value, ...(marks ? { marks } : {}) });
const para = (...content: unknown[]) => ({ type: "paragraph", content });
const doc = (...content: unknown[]) => ({ type: "doc", content });
const link = (href: unknown, extra: Record<string, unknown> = {}) =>
  doc(para(text("here", [{ type: "link", attrs: { href, ...extra } }])));
const nested = (levels: number) => {
  let node: unknown = para(text("deep"));
  for (let i = 0; i < levels; i++) node = { type: "blockquote", content: [node] };
  return doc(node);
};

const SCRIPT_LINKS = [
  "javascript:alert(1)",
  "JaVaScRiPt:alert(1)",
  " javascript:alert(1)",
  "\tjavascript:alert(1)",
  "java\tscript:alert(1)",
  "java\nscript:alert(1)",
  "java\u0000script:alert(1)",
  "\u0001javascript:alert(1)",
  "\u200bjavascript:alert(1)",
  "&#106;avascript:alert(1)",
  "&#x6A;avascript:alert(1)",
  "&#0000106&#0000097vascript:alert(1)",
  "javascript&colon;alert(1)",
  "&amp;#106;avascript:alert(1)",
  "jav&#x09;ascript:alert(1)",
  "data:text/html;base64,PHNjcmlwdD5hbGVydCgxKTwvc2NyaXB0Pg==",
  "DATA:text/html,<script>alert(1)</script>",
  "vbscript:msgbox(1)",
  "  VBScript:msgbox(1)",
  "//evil.example/path",
  "/relative/path",
  "file:///etc/passwd",
  "https://ok.example/ path",
];

/** Refused outright: the answer is a 400 that says why. */
const REFUSED: [string, unknown][] = [
  ...SCRIPT_LINKS.map((href): [string, unknown] => [`link ${JSON.stringify(href)}`, link(href)]),
  ["link with no address", link("")],
  ["link whose address is not text", link({ toString: "javascript:alert(1)" })],
  ["image from another site", doc({ type: "image", attrs: { src: "https://evil.example/pixel.png" } })],
  ["image from our own store, inside the text", doc({ type: "image", attrs: { src: "/media/photos/2030-01/abc/960.jpg" } })],
  ["paragraph with an image source", doc({ type: "paragraph", attrs: { src: "https://evil.example/x.png" } })],
  ["protocol-relative image", doc(para({ type: "image", attrs: { src: "//evil.example/x.png" } }))],
  ["script node", doc({ type: "script", content: [text("alert(1)")] })],
  ["iframe node", doc({ type: "iframe", attrs: { src: "https://evil.example" } })],
  ["raw HTML node", doc({ type: "html", text: "<img src=x onerror=alert(1)>" })],
  ["unknown mark", doc(para(text("hi", [{ type: "textStyle", attrs: { color: "red" } }])))],
  ["marks that are not a list", doc(para({ type: "text", text: "hi", marks: "bold" }))],
  [
    "__proto__ attribute kept by a parser",
    JSON.parse('{"type":"doc","content":[{"type":"paragraph","attrs":{"__proto__":{"polluted":true}}}]}'),
  ],
  ["attribute holding an object", doc({ type: "heading", attrs: { level: { valueOf: 1 } }, content: [text("x")] })],
  ["attribute far too long", doc({ type: "orderedList", attrs: { start: 1, type: "x".repeat(5000) }, content: [] })],
  [`nesting of ${BODY_MAX_DEPTH + 1} levels`, nested(BODY_MAX_DEPTH)],
  ["nesting of 10 000 levels", nested(10_000)],
  ["one huge text", doc(para(text("a".repeat(BODY_MAX_BYTES + 1))))],
  ["many paragraphs past the size limit", doc(...Array.from({ length: 300 }, () => para(text("b".repeat(800)))))],
  ["empty text node", doc(para(text("")))],
  ["text that is not text", doc(para({ type: "text", text: 42 }))],
  ["content that is not a list", { type: "doc", content: "<script>alert(1)</script>" }],
  ["list item outside a list", doc({ type: "listItem", content: [para(text("x"))] })],
  ["not a document", { type: "paragraph", content: [] }],
  ["an array", [doc(para(text("x")))]],
  ["null", null],
  ["a string", '{"type":"doc"}'],
];

/** Accepted, with nothing dangerous left in what is stored or shown. */
const NEUTRALISED: [string, unknown][] = [
  ["script tags as text", doc(para(text("<script>alert(1)</script>")))],
  ["an attribute the schema does not know", doc({ type: "paragraph", attrs: { onclick: "alert(1)" }, content: [text("x")] })],
  [
    "a list start that breaks out of its quotes",
    doc({
      type: "orderedList",
      attrs: { start: '1" onclick="alert(1)' },
      content: [{ type: "listItem", content: [para(text("a"))] }],
    }),
  ],
  ["a heading level that is markup", doc({ type: "heading", attrs: { level: "1 onload=alert(1)" }, content: [text("x")] })],
  [
    "a code language that closes the tag",
    doc({ type: "codeBlock", attrs: { language: '"><script>alert(1)</script>' }, content: [text("x")] }),
  ],
  ["a link class that closes the tag", link("https://ok.example", { class: '"><img src=x onerror=alert(1)>' })],
  ["a plain web link", link("https://parts.example/bracket?size=m8&finish=zinc")],
  ["a mail link", link("mailto:shop@fernbrook.example")],
];

const ATTRIBUTES = new Set(["href", "target", "rel", "class", "start", "type"]);

/** Every tag well formed, with only known attributes whose quoted values hold no quote or bracket, and safe links. */
function unsafeHtml(html: string): string[] {
  const problems: string[] = [];
  for (const tag of html.match(/<[^>]*>/g) ?? []) {
    if (/^<\//.test(tag)) continue;
    const match = /^<([a-z][a-z0-9]*)((?:\s+[a-z-]+="[^"<>]*")*)\s*\/?>$/.exec(tag);
    if (!match) {
      problems.push(`malformed tag ${tag}`);
      continue;
    }
    if (["script", "iframe", "img", "object", "embed", "style"].includes(match[1])) problems.push(`tag ${match[1]}`);
    for (const [, name, value] of match[2].matchAll(/([a-z-]+)="([^"]*)"/g)) {
      if (!ATTRIBUTES.has(name)) problems.push(`attribute ${name}`);
      if (name === "href" && !/^(https?:|mailto:)/i.test(value)) problems.push(`href ${value}`);
    }
  }
  return problems;
}

function outcome(body: unknown): { refused: string } | { html: string; json: unknown } {
  try {
    const { html, json } = renderBody(body);
    return { html, json };
  } catch (error) {
    if (error instanceof AppError && error.status === 400) return { refused: error.message };
    throw error;
  }
}

describe("step bodies checked on write", () => {
  it("holds at least 30 hostile documents", () => {
    expect(REFUSED.length + NEUTRALISED.length).toBeGreaterThanOrEqual(30);
  });

  it.each(REFUSED)("refuses %s with a 400 that says why", (_name, body) => {
    const result = outcome(body);
    expect(result).toHaveProperty("refused");
    expect((result as { refused: string }).refused.length).toBeGreaterThan(10);
  });

  it.each(NEUTRALISED)("accepts %s with nothing unsafe in the HTML or the stored document", (_name, body) => {
    const result = outcome(body);
    if ("refused" in result) throw new Error(`refused: ${result.refused}`);
    expect(unsafeHtml(result.html)).toEqual([]);
    expect(result.html).not.toMatch(/<script|<img/i);
    expect(JSON.stringify(result.json)).not.toMatch(/onclick"|"src"/);
  });

  it("drops __proto__, constructor and prototype keys while the body is parsed, at any depth", () => {
    const parsed = parseJsonWithoutPoison(
      '{"__proto__":{"admin":true},"a":{"constructor":{"prototype":{"x":1}},"b":[{"__proto__":{"y":2},"c":3}]}}',
    ) as Record<string, unknown>;
    expect(JSON.stringify(parsed)).toBe('{"a":{"b":[{"c":3}]}}');
    expect(({} as Record<string, unknown>).admin).toBeUndefined();
    expect(Object.getPrototypeOf(parsed)).toBe(Object.prototype);
  });

  it("reads character references the way a browser does before judging a link", () => {
    // HTML Living Standard, character references: decimal, hexadecimal, named, semicolon optional.
    expect(decodeEntities("&#106;&#x61;&#0000118;a&colon;")).toBe("java:");
    expect(decodeEntities("&amp;#106;")).toBe("j");
    expect(linkProblem("https://ok.example")).toBeNull();
  });

  it("never throws anything but a 400 for any JSON value, and whatever it accepts renders safely (fast-check)", () => {
    const nodeish = fc.letrec((tie) => ({
      node: fc.record(
        {
          type: fc.constantFrom("doc", "paragraph", "text", "heading", "bulletList", "listItem", "blockquote", "image", "link"),
          text: fc.oneof(fc.string(), fc.constant("javascript:alert(1)")),
          attrs: fc.dictionary(
            fc.constantFrom("href", "src", "level", "start", "__proto__", "class"),
            fc.jsonValue({ maxDepth: 1 }),
          ),
          marks: fc.array(fc.record({ type: fc.constantFrom("bold", "link", "code", "x"), attrs: fc.object({ maxDepth: 1 }) }), {
            maxLength: 2,
          }),
          content: fc.array(tie("node"), { maxLength: 3 }),
        },
        { requiredKeys: ["type"] },
      ),
    }));
    fc.assert(
      fc.property(fc.oneof(fc.jsonValue(), nodeish.node), (body) => {
        const result = outcome(body);
        if ("html" in result) expect(unsafeHtml(result.html)).toEqual([]);
      }),
      { numRuns: 400 },
    );
  });
});

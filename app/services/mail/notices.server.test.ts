import { type ChildNode, type Element, isTag } from "domhandler";
import { parseDocument } from "htmlparser2";
import { describe, expect, it } from "vitest";
import { updateEnv } from "~/utils/env.server";
import { optOutToken, readOptOutToken } from "./opt-out-token.server";
import {
  changesRequestedNotice,
  fitmentReportNotice,
  guidePublishedNotice,
  guideUnpublishedNotice,
  revisionSubmittedNotice,
} from "./notices.server";

// The HTML is read back with htmlparser2 (an HTML parser from npm, not the project's code): what it
// finds as text must be exactly what was passed in, and no element or attribute may come from it.
const hostile = `Relay <script>alert("x")</script> & "fuse" 'tap' <img src=x onerror=alert(1)>`;
const to = { userId: 42, email: "mirela@example.test", name: `Mirela <b>Ostrova</b>` };

const all = () => [
  revisionSubmittedNotice({
    to,
    guideTitle: hostile,
    authorName: hostile,
    revisionNumber: 3,
    changeSummary: hostile,
    reviewUrl: "https://t.example/review/9",
  }),
  changesRequestedNotice({
    to,
    guideTitle: hostile,
    editorName: hostile,
    revisionNumber: 2,
    note: hostile,
    comments: [{ step: "Step 2", text: hostile }],
    workbenchUrl: "https://t.example/workbench/guides/7",
  }),
  guidePublishedNotice({
    to,
    guideTitle: hostile,
    editorName: hostile,
    revisionNumber: 4,
    guideUrl: "https://t.example/guides/x",
  }),
  guideUnpublishedNotice({ to, guideTitle: hostile, editorName: hostile, reason: hostile, workbenchUrl: "https://t.example/w" }),
  fitmentReportNotice({
    to,
    guideTitle: hostile,
    reporterName: hostile,
    vehicle: "Fjell F3 (2021)",
    status: "fits-with-changes",
    note: hostile,
    guideUrl: "https://t.example/guides/x",
  }),
];

const elements = (nodes: ChildNode[]): Element[] =>
  nodes.flatMap((n) => (isTag(n) ? [n, ...elements(n.children)] : "children" in n ? elements(n.children as ChildNode[]) : []));
const textOf = (nodes: ChildNode[]): string =>
  nodes.map((n) => (n.type === "text" ? n.data : "children" in n ? textOf(n.children as ChildNode[]) : "")).join("");

describe("review-desk notices", () => {
  it("escape every value in the HTML part: the parser sees the text as text, and no tag or attribute of it", () => {
    for (const mail of all()) {
      const doc = parseDocument(mail.html, { decodeEntities: true });
      const found = elements(doc.children);
      expect(
        found.filter((e) => e.name === "script" || e.name === "img" || e.name === "b"),
        mail.subject,
      ).toEqual([]);
      expect(found.some((e) => Object.keys(e.attribs).some((a) => a.startsWith("on")))).toBe(false);
      expect(textOf(doc.children)).toContain(hostile);
      expect(textOf(doc.children)).toContain("Hello Mirela <b>Ostrova</b>,");
      // The plain-text part is not HTML: it carries the words as they are.
      expect(mail.text).toContain(hostile);
    }
  });

  it("each carry the recipient's own one-click opt-out link for their kind, in both parts", () => {
    for (const mail of all()) {
      expect(mail.userId).toBe(42);
      expect(mail.to).toBe("mirela@example.test");
      const links = [...mail.text.matchAll(/https?:\/\/\S+\/mail\/opt-out\/(\S+)/g)].map((m) => m[1]);
      expect(links, mail.subject).toHaveLength(1);
      expect(readOptOutToken(links[0])).toEqual({ userId: 42, kind: mail.kind });
      const hrefs = elements(parseDocument(mail.html).children)
        .map((e) => e.attribs.href)
        .filter((h) => h?.includes("/mail/opt-out/"));
      expect(hrefs.map((h) => h.split("/mail/opt-out/")[1])).toEqual(links);
      expect(mail.text).toContain("/me/account#mail");
    }
  });

  it("are of the five kinds other than account mail, each once", () => {
    expect(all().map((m) => m.kind)).toEqual([
      "revision-submitted",
      "changes-requested",
      "guide-published",
      "guide-unpublished",
      "fitment-report",
    ]);
  });

  it("quote an editor's comments with their line breaks, one line each in the text part", () => {
    const mail = changesRequestedNotice({
      to,
      guideTitle: "Rear USB charger",
      editorName: "Editor Tamsin",
      revisionNumber: 2,
      note: "Two things:\nthe fuse rating\nand the grommet",
      comments: [{ step: "Step 2", text: "Use a 10 A fuse here." }, { text: "Add a photo of the tap." }],
      workbenchUrl: "https://t.example/workbench/guides/7",
    });
    expect(mail.text).toContain("> Two things:\n> the fuse rating\n> and the grommet");
    expect(mail.text).toContain("- Step 2: Use a 10 A fuse here.\n- Add a photo of the tap.");
    expect(mail.html).toContain("Two things:<br>the fuse rating<br>and the grommet");
  });
});

describe("opt-out tokens", () => {
  it("refuse a changed user, kind or signature, and malformed ones", () => {
    const [mail] = all();
    const token = mail.text.match(/\/mail\/opt-out\/(\S+)/)?.[1] ?? "";
    const [id, kind, signature] = token.split(".");
    const flip = (s: string, i: number) => s.slice(0, i) + (s[i] === "A" ? "B" : "A") + s.slice(i + 1);
    expect(readOptOutToken(`43.${kind}.${signature}`)).toBeNull();
    expect(readOptOutToken(`${id}.guide-published.${signature}`)).toBeNull();
    expect(readOptOutToken(`${id}.account.${signature}`)).toBeNull();
    for (const i of [0, 20, signature.length - 1]) expect(readOptOutToken(`${id}.${kind}.${flip(signature, i)}`)).toBeNull();
    for (const bad of ["", "x", `${id}.${kind}`, `0.${kind}.${signature}`, `${token}.`, `${token}x`, "a".repeat(5000)]) {
      expect(readOptOutToken(bad), bad.slice(0, 40)).toBeNull();
    }
  });

  it("are signed with the first SESSION_SECRET and read with any of them, so rotating it keeps mailed links working", () => {
    const before = process.env.SESSION_SECRET;
    try {
      updateEnv({ SESSION_SECRET: "first-secret-for-the-test-0001" });
      const old = optOutToken(42, "guide-published");
      updateEnv({ SESSION_SECRET: "second-secret-for-the-test-002,first-secret-for-the-test-0001" });
      expect(readOptOutToken(old)).toEqual({ userId: 42, kind: "guide-published" });
      const fresh = optOutToken(42, "guide-published");
      expect(fresh).not.toBe(old);
      updateEnv({ SESSION_SECRET: "second-secret-for-the-test-002" });
      expect(readOptOutToken(fresh)).toEqual({ userId: 42, kind: "guide-published" });
      expect(readOptOutToken(old)).toBeNull();
    } finally {
      if (before === undefined) delete process.env.SESSION_SECRET;
      else process.env.SESSION_SECRET = before;
      updateEnv({});
    }
  });
});

import { strToU8, zipSync } from "fflate";
import type { JSONContent } from "@tiptap/core";
import type { Db } from "~/db/client.server";
import { type Callout, evaluateCallout, storedCallout, TORQUE_SOURCE_LABELS } from "~/engine/callouts";
import { num } from "~/engine/format";
import type { Storage } from "~/services/storage.server";
import { notFound } from "~/utils/errors";
import type { Actor } from "~/utils/permissions";
import { CATEGORY_LABELS, DIFFICULTY_LABELS, FITMENT_LABELS, POWERTRAIN_LABELS } from "~/utils/vocab";
import { assertCanReadDraft, type DraftDocument, draftDocument } from "./drafts.server";
import { DRAFT_EXPORT_FORMAT, DRAFT_EXPORT_VERSION } from "./guide-input";
import { getGuideById, type LoadedRevision, loadRevision } from "./guides.server";

/** The author's own copy of a guide, with no lock-in: the draft JSON the API speaks, or Markdown and photos in a zip. */

export type DraftExport = { format: typeof DRAFT_EXPORT_FORMAT; formatVersion: typeof DRAFT_EXPORT_VERSION } & Omit<
  DraftDocument,
  "version"
>;

/** The guide's working revision (or its published one) for someone who may read its draft. */
async function exportedRevision(db: Db, actor: Actor | null | undefined, guideId: number) {
  const guide = await getGuideById(db, guideId);
  if (!guide) throw notFound("This guide");
  assertCanReadDraft(actor, guide);
  const revisionId = guide.workingRevisionId ?? guide.publishedRevisionId;
  const loaded = revisionId ? await loadRevision(db, revisionId) : null;
  if (!loaded) throw notFound("This guide's draft");
  return { guide, loaded };
}

/** The draft as `GET …/draft` gives it, less its save version, beside a format marker; `POST /api/guides/import` reads it back. */
export function draftExport(loaded: LoadedRevision, storage: Pick<Storage, "publicUrl">): DraftExport {
  const { version: _version, ...draft } = draftDocument(loaded, storage);
  return { format: DRAFT_EXPORT_FORMAT, formatVersion: DRAFT_EXPORT_VERSION, ...draft };
}

export async function exportDraftJson(
  db: Db,
  storage: Pick<Storage, "publicUrl">,
  actor: Actor | null | undefined,
  guideId: number,
) {
  const { guide, loaded } = await exportedRevision(db, actor, guideId);
  return { slug: guide.slug, body: draftExport(loaded, storage) };
}

// ── Markdown ───────────────────────────────────────────────────────

/** Characters CommonMark reads as formatting, escaped so an author's words print as written. */
const escapeMd = (text: string) => text.replace(/([\\`*_[\]<>|])/g, "\\$1");

function inline(nodes: JSONContent[] | undefined): string {
  return (nodes ?? [])
    .map((node) => {
      if (node.type === "hardBreak") return "  \n";
      if (node.type !== "text") return inline(node.content);
      let text = escapeMd(node.text ?? "");
      for (const mark of node.marks ?? []) {
        if (mark.type === "bold") text = `**${text}**`;
        else if (mark.type === "italic") text = `*${text}*`;
        else if (mark.type === "strike") text = `~~${text}~~`;
        else if (mark.type === "code") text = `\`${node.text ?? ""}\``;
        else if (mark.type === "link" && typeof mark.attrs?.href === "string") text = `[${text}](<${mark.attrs.href}>)`;
      }
      return text;
    })
    .join("");
}

/** A step body (already checked against the schema on save) as Markdown blocks; its headings sit below the step's own. */
export function bodyMarkdown(node: JSONContent, indent = ""): string[] {
  const children = node.content ?? [];
  switch (node.type) {
    case "doc":
      return children.flatMap((child) => bodyMarkdown(child, indent));
    case "paragraph":
      return [`${indent}${inline(children)}`];
    case "heading": {
      const level = Math.min(6, 3 + Number(node.attrs?.level ?? 1));
      return [`${indent}${"#".repeat(level)} ${inline(children)}`];
    }
    case "blockquote":
      return children.flatMap((child) => bodyMarkdown(child, indent)).map((line) => `> ${line}`);
    case "codeBlock":
      return [`${indent}\`\`\`\n${children.map((c) => c.text ?? "").join("")}\n${indent}\`\`\``];
    case "horizontalRule":
      return [`${indent}---`];
    case "bulletList":
    case "orderedList": {
      const start = Number(node.attrs?.start ?? 1) || 1;
      const items = children.map((item, i) => {
        const marker = node.type === "bulletList" ? "-" : `${start + i}.`;
        const [first = "", ...rest] = (item.content ?? []).flatMap((child) => bodyMarkdown(child, `${indent}   `));
        return [`${indent}${marker} ${first.trimStart()}`, ...rest].join("\n");
      });
      return [items.join("\n")];
    }
    default:
      return children.length ? [`${indent}${inline(children)}`] : [];
  }
}

/** A torque in every unit the product shows (N·m, lbf·ft, lbf·in; NIST SP 811 factors in app/engine/torque.ts). */
const torqueUnits = (v: { nm: number; lbfFt: number; lbfIn: number }) =>
  `${num(v.nm, 1)} N·m · ${num(v.lbfFt, 1)} lbf·ft · ${num(v.lbfIn, 1)} lbf·in`;

function wireLabel(wire: { awg: number } | { mm2: number } | undefined) {
  if (!wire) return "not chosen";
  return "awg" in wire ? `${wire.awg} AWG` : `${wire.mm2} mm²`;
}

/** One callout as a readable quoted block. */
export function calloutMarkdown(callout: Callout): string[] {
  // One paragraph per line inside the quote, so a Markdown reader keeps them apart.
  const quote = (lines: string[]) => lines.flatMap((line, i) => (i ? [">", `> ${line}`] : [`> ${line}`]));
  switch (callout.kind) {
    case "torque": {
      const { values, estimate } = evaluateCallout(callout);
      const detail = [
        callout.size,
        callout.propertyClass && `class ${callout.propertyClass}`,
        callout.lubricated ? "lubricated" : callout.lubricated === false || callout.estimate ? "dry" : null,
      ]
        .filter(Boolean)
        .join(", ");
      const lines = [`**Torque: ${escapeMd(callout.fastener)}**${detail ? ` (${escapeMd(detail)})` : ""}`];
      if (values) lines.push(`${torqueUnits(values)}`);
      if (estimate) lines.push(`Estimate: ${torqueUnits(estimate)}. ${estimate.caution}`);
      if (callout.threadlocker) lines.push(`Threadlocker: ${escapeMd(callout.threadlocker)}`);
      if (callout.valueSource) lines.push(`Source: ${TORQUE_SOURCE_LABELS[callout.valueSource]}.`);
      return quote(lines);
    }
    case "circuit": {
      const { result } = evaluateCallout(callout);
      const load = callout.loadWatts !== undefined ? `${callout.loadWatts} W` : `${callout.loadAmps} A`;
      const lines = [
        `**Circuit${callout.label ? `: ${escapeMd(callout.label)}` : ""}**`,
        `Load ${load} at ${callout.systemVoltage} V (${num(result.currentA)} A), fed from the ${callout.feed === "battery" ? "battery" : "fuse box"}, ${callout.oneWayLengthM} m one way, ${callout.returnPath === "chassis" ? "chassis" : "wire"} return.`,
        `Fuse ${callout.fuseA === undefined ? "not chosen" : callout.fuseA === null ? "none" : `${callout.fuseA} A`} (recommended ${result.recommendedFuseA ?? "none fits"}${result.recommendedFuseA ? " A" : ""}); wire ${wireLabel(callout.wire)} (smallest that fits: ${result.minWire.awg ? `${result.minWire.awg} AWG` : "none"}${result.minWire.mm2 ? ` or ${result.minWire.mm2} mm²` : ""}); relay ${callout.relay === undefined ? "not decided" : callout.relay ? "used" : "not used"}.`,
      ];
      if (result.chosen)
        lines.push(`Voltage drop at the chosen wire: ${num(result.chosen.dropV)} V (${num(result.chosen.dropPct, 1)} %).`);
      for (const finding of result.findings) lines.push(`- ${finding.severity.toUpperCase()}: ${finding.message}`);
      lines.push("Follow the vehicle maker's instructions, local codes and licensed practice for any electrical work.");
      return quote(lines);
    }
    case "caution":
      return quote([`**${callout.signalWord}**`, escapeMd(callout.text)]);
    case "tip":
      return quote([`**Tip**`, escapeMd(callout.text)]);
  }
}

type Photo = { path: string; key: string };

/** The JPEG of one width kept in the zip for each photo: 960 px, else the nearest the upload made. */
function photoKey(variants: { width: number; format: string; key: string }[]): string | null {
  const jpegs = variants.filter((v) => v.format === "jpeg").sort((a, b) => Math.abs(a.width - 960) - Math.abs(b.width - 960));
  return jpegs[0]?.key ?? null;
}

/** guide.md for a loaded revision, and the photos it names (paths inside the zip, keys in the store). */
export function guideMarkdown(loaded: LoadedRevision): { markdown: string; photos: Photo[] } {
  const { revision } = loaded;
  const photos: Photo[] = [];
  const out: string[] = [`# ${escapeMd(revision.title)}`, ""];
  if (revision.summary) out.push(escapeMd(revision.summary), "");
  out.push(
    `- Category: ${CATEGORY_LABELS[revision.category as keyof typeof CATEGORY_LABELS] ?? revision.category}`,
    `- Difficulty: ${revision.difficulty} of 5 (${DIFFICULTY_LABELS[revision.difficulty] ?? ""})`,
    `- Time: about ${revision.minutes} minutes`,
    "",
    "> Follow the vehicle maker's instructions wherever they differ from this guide. Electrical, lifting, airbag and high-voltage work also follows local codes and licensed practice.",
    "",
  );

  out.push("## Fitment", "");
  if (loaded.fitment.length) {
    out.push("| Vehicle | Powertrain | Drivetrain | Fits | Note |", "|---|---|---|---|---|");
    for (const row of loaded.fitment) {
      const v = row.variant;
      const vehicle = `${v.generation.model.make.name} ${v.generation.model.name} ${v.generation.name} (${v.name})`;
      out.push(
        `| ${escapeMd(vehicle)} | ${POWERTRAIN_LABELS[v.powertrain]} | ${v.drivetrain} | ${FITMENT_LABELS[row.status]} | ${escapeMd(row.note ?? "")} |`,
      );
    }
  } else out.push("No fitment listed yet.");
  out.push("");

  out.push("## Parts", "");
  if (loaded.parts.length) {
    out.push("| Part | Quantity | Part number | Step | Notes |", "|---|---|---|---|---|");
    for (const p of loaded.parts) {
      out.push(
        `| ${escapeMd(p.name)} | ${p.quantity} | ${escapeMd(p.partNumber ?? "")} | ${p.stepIndex === null ? "" : p.stepIndex + 1} | ${escapeMd(p.notes ?? "")} |`,
      );
    }
  } else out.push("No parts listed.");
  out.push("");

  out.push("## Tools", "");
  out.push(...(loaded.tools.length ? loaded.tools.map((t) => `- ${escapeMd(t.name)}`) : ["No tools listed."]), "");

  loaded.steps.forEach((step, i) => {
    out.push(`## Step ${i + 1}: ${escapeMd(step.title)}`, "");
    const flags = [step.liftsVehicle && "lifts the vehicle", step.disconnectsBattery && "disconnects the 12 V battery"].filter(
      Boolean,
    );
    if (flags.length) out.push(`*This step ${flags.join(" and ")}.*`, "");
    for (const block of bodyMarkdown(step.body as JSONContent)) out.push(block, "");
    step.photos.forEach((photo, j) => {
      const key = photoKey(photo.media.variants);
      if (!key) return;
      const path = `photos/step-${String(i + 1).padStart(2, "0")}-${j + 1}.jpg`;
      photos.push({ path, key });
      out.push(`![${escapeMd(photo.alt)}](${path})`);
      if (photo.caption) out.push(`*${escapeMd(photo.caption)}*`);
      out.push("");
    });
    for (const row of step.callouts) {
      out.push(...calloutMarkdown(storedCallout(row)), "");
    }
  });
  return {
    markdown: `${out
      .join("\n")
      .replace(/\n{3,}/g, "\n\n")
      .trim()}\n`,
    photos,
  };
}

async function readAll(body: AsyncIterable<Uint8Array>): Promise<Uint8Array> {
  const chunks: Buffer[] = [];
  for await (const chunk of body) chunks.push(Buffer.from(chunk));
  return Buffer.concat(chunks);
}

/** guide.md and each photo (one width, JPEG) fetched from the store, as one zip. */
export async function exportMarkdownZip(
  db: Db,
  storage: Pick<Storage, "get">,
  actor: Actor | null | undefined,
  guideId: number,
): Promise<{ slug: string; zip: Uint8Array }> {
  const { guide, loaded } = await exportedRevision(db, actor, guideId);
  const { markdown, photos } = guideMarkdown(loaded);
  const files: Record<string, Uint8Array> = { "guide.md": strToU8(markdown) };
  // A photo the store cannot give is the server's fault, not the caller's: it fails as such.
  for (const photo of photos) files[photo.path] = await readAll((await storage.get(photo.key)).body);
  // JPEGs are compressed already: stored as they are; the text is deflated.
  const zip = zipSync(
    Object.fromEntries(Object.entries(files).map(([path, bytes]) => [path, [bytes, { level: path.endsWith(".jpg") ? 0 : 6 }]])),
  );
  return { slug: guide.slug, zip };
}

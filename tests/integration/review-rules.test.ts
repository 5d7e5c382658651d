import { beforeAll, describe, expect, it } from "vitest";
import type { Db } from "~/db/client.server";
import { findings, type User } from "~/db/schema";
import { runSafetyRules } from "~/engine/rules";
import { createGuide, loadRevision, rulesInput, saveDraft } from "~/models/guides.server";
import { reviewDeskView } from "~/models/review-desk.server";
import { approveRevision, revisionCautions, signOffCaution, submitRevision } from "~/models/review.server";
import type { Storage } from "~/services/storage.server";
import { useTestDatabase } from "../support/base-db";
import { currentRevision, demoUser, draftFrom, rejection } from "./revision-fixtures";

// The safety rules of design/engine.md §3 on the demo content as stored, through the model
// functions the review desk uses, against a copy of the demo database.

let db: Db;
let storage: Pick<Storage, "publicUrl">;
let author: User;
let editor: User;

beforeAll(async () => {
  useTestDatabase("review-rules");
  db = await (await import("~/db/client.server")).getDb();
  storage = (await import("~/services/storage.server")).getStorage();
  author = await demoUser(db, "author@torqueleaf.test");
  editor = await demoUser(db, "editor@torqueleaf.test");
});

type Draft = ReturnType<typeof draftFrom>;

/** A new guide by the demo author with a demo guide's content (her own photos), changed by `change`. */
async function draftLike(slug: string, title: string, change: (input: Draft) => void) {
  const source = await currentRevision(db, slug);
  const created = await createGuide(db, author, { ...source.revision, title });
  const input = { ...draftFrom(source), title, version: created.draft.version };
  change(input);
  await saveDraft(db, created.id, author, input);
  const loaded = await loadRevision(db, created.draft.revisionId);
  if (!loaded) throw new Error("the draft was not saved");
  return { created, input, loaded };
}

function firstCircuit(input: Draft) {
  for (const [stepIndex, step] of input.steps.entries()) {
    const calloutIndex = step.callouts.findIndex((c) => c.kind === "circuit");
    const callout = step.callouts[calloutIndex];
    if (callout?.kind === "circuit") return { stepIndex, calloutIndex, callout };
  }
  throw new Error("no circuit callout in the demo guide");
}

describe("fuse-exceeds-wire on the demo lamp harness", () => {
  it("fires for a 30 A fuse on 18 AWG in the engine bay, blocks the submission, and a stored one blocks approval (409)", async () => {
    let at = { stepIndex: -1, calloutIndex: -1 };
    const { created, loaded } = await draftLike("kestrel-hood-auxiliary-lamps", "Lamp harness on thin wire", (input) => {
      const found = firstCircuit(input);
      at = found;
      Object.assign(found.callout, { wire: { awg: 18 }, fuseA: 30, location: "engine-bay", insulationC: 105, bundled: 1 });
    });
    const finding = runSafetyRules(rulesInput(loaded)).find((f) => f.rule === "fuse-exceeds-wire");
    // 33 CFR 183.425 Table 5: 18 AWG at 105 °C carries 20 A, × 0.85 in an engine space = 17 A;
    // 33 CFR 183.455(c)(1): the fuse may be at most 150 % of that, 25.5 A. 30 A is above it.
    expect(finding).toMatchObject({
      severity: "blocking",
      source: "cfr-183-455",
      stepIndex: at.stepIndex,
      calloutIndex: at.calloutIndex,
    });
    expect(finding?.numbers?.ampacityA).toBeCloseTo(17, 6);
    expect(finding?.numbers?.limitA).toBeCloseTo(25.5, 6);

    // The author can fix it, so the draft cannot reach the desk like this (422 at the callout).
    const refused = await rejection(submitRevision(db, created.id, author, "First version"));
    expect(refused).toMatchObject({ status: 422, extra: { missing: ["findings"] } });
    expect(refused.fields?.[`steps.${at.stepIndex}.callouts.${at.calloutIndex}`]).toContain("30 A fuse");

    // A revision that reached the desk with the same finding stored (as after a rule change):
    // shown with its source and numbers, and approval is refused with 409 however the cautions stand.
    const { created: reviewed } = await draftLike("kestrel-hood-auxiliary-lamps", "Lamp harness, checked again", () => {});
    const { revisionId } = await submitRevision(db, reviewed.id, author, "First version");
    if (!finding) throw new Error("no finding");
    await db.insert(findings).values({
      revisionId,
      rule: finding.rule,
      severity: finding.severity,
      stepIndex: finding.stepIndex,
      message: finding.message,
      numbers: finding.numbers ?? null,
    });
    for (const c of await revisionCautions(db, revisionId)) await signOffCaution(db, revisionId, editor, { cautionId: c.id });
    const view = await reviewDeskView(db, storage, editor, revisionId);
    expect(view.findings.find((f) => f.rule === "fuse-exceeds-wire")).toMatchObject({
      severity: "blocking",
      source: { id: "cfr-183-455" },
      numbers: { fuseA: 30 },
    });
    const approval = await rejection(approveRevision(db, revisionId, editor));
    expect(approval).toMatchObject({ status: 409, code: "not-ready", extra: { blockingFindings: 1, unsignedCautions: [] } });
    expect((await loadRevision(db, revisionId))?.revision.state).toBe("in-review");
  });
});

describe("hv-caution-missing on the demo plug-in hybrid charger", () => {
  it("fires once the high-voltage WARNING is taken out of a guide that fits a plug-in hybrid and has electrical steps", async () => {
    const { loaded, input } = await draftLike("fjell-phev-rear-usb-charger", "Rear charger without the HV warning", (draft) => {
      for (const step of draft.steps)
        step.callouts = step.callouts.filter((c) => c.kind !== "caution" || !/high-voltage/i.test(c.text));
    });
    expect(input.steps.some((s) => s.callouts.some((c) => c.kind === "circuit"))).toBe(true);
    expect(loaded.fitment.some((f) => f.variant.powertrain === "plug-in-hybrid" && f.status !== "does-not-fit")).toBe(true);
    const found = runSafetyRules(rulesInput(loaded));
    // engine.md §3: blocking when a hybrid, plug-in hybrid or electric variant fits, a step has a
    // circuit, and no DANGER or WARNING caution mentions the high-voltage system (common practice).
    expect(found.filter((f) => f.rule === "hv-caution-missing")).toMatchObject([
      { severity: "blocking", source: "common-practice" },
    ]);

    // With the demo's own WARNING in place the rule stays quiet.
    const demo = await currentRevision(db, "fjell-phev-rear-usb-charger");
    expect(runSafetyRules(rulesInput(demo)).map((f) => f.rule)).not.toContain("hv-caution-missing");
  });
});

import { and, eq, inArray } from "drizzle-orm";
import fc from "fast-check";
import { beforeAll, describe, expect, it } from "vitest";
import type { Db } from "~/db/client.server";
import { callouts, cautionSignoffs, findings, guides, revisions, steps, type User } from "~/db/schema";
import { createGuide, saveDraft } from "~/models/guides.server";
import {
  approveRevision,
  requestChanges,
  revisionCautions,
  signOffCaution,
  startNextRevision,
  submitRevision,
  unpublishGuide,
} from "~/models/review.server";
import { AppError } from "~/utils/errors";
import { useTestDatabase } from "../support/base-db";
import { currentRevision, demoUser, draftFrom } from "./revision-fixtures";

// The review workflow as a model-based property (fast-check `commands`): random sequences of
// save, submit, sign-off, request changes, approve, unpublish, and two at once (approve with an
// edit, approve with approve), run through the model functions against a real SQLite file. After
// every step: never a published revision with a blocking finding or an unsigned caution, never
// the published revision lost, never two published, never the author approving their own work.
// Whether a caution counts as signed is decided here independently (engine.md §3 caution-unsigned
// and the sign-off-per-wording rule of issue 12), not by asking `revisionCautions`.

let db: Db;
let author: User;
let editor: User;
let secondEditor: User;
let base: ReturnType<typeof draftFrom>;

beforeAll(async () => {
  useTestDatabase("review-workflow");
  db = await (await import("~/db/client.server")).getDb();
  author = await demoUser(db, "author@torqueleaf.test");
  editor = await demoUser(db, "editor@torqueleaf.test");
  secondEditor = await demoUser(db, "admin@torqueleaf.test");
  base = draftFrom(await currentRevision(db, "kestrel-hood-auxiliary-lamps"));
});

type Model = { everPublished: boolean; lastPublished: number | null; unpublished: boolean };

/** How often the runs reached each outcome: a property whose runs never publish would prove nothing. */
const reached = { published: 0, refusedApproval: 0, unpublished: 0, sentBack: 0 };
type Real = { guideId: number };

/** What an author may write in a save: a fuse that is too big for its wire (blocking), a reworded caution, an extra step. */
type Content = { oversizedFuse: boolean; reword: number; extraStep: boolean };

function draftWith(content: Content, version: number, title: string) {
  const input = structuredClone(base);
  input.version = version;
  input.title = title;
  const circuit = input.steps.flatMap((s) => s.callouts).find((c) => c.kind === "circuit");
  // 30 A on 18 AWG in the engine bay: above 150 % of 17 A (33 CFR 183.425 / 183.455(c)(1)).
  if (circuit?.kind === "circuit" && content.oversizedFuse) Object.assign(circuit, { wire: { awg: 18 }, fuseA: 30 });
  const caution = input.steps.flatMap((s) => s.callouts).find((c) => c.kind === "caution");
  if (caution?.kind === "caution" && content.reword) caution.text = `${caution.text} (wording ${content.reword})`;
  if (content.extraStep) {
    input.steps.push({
      title: "Tidy the loom",
      body: { type: "doc", content: [{ type: "paragraph", content: [{ type: "text", text: "Tie the loom every 150 mm." }] }] },
      liftsVehicle: false,
      disconnectsBattery: false,
      photos: [],
      callouts: [],
    });
  }
  return input;
}

/** Refusals a user can cause are fine; anything else (a 500, a raw database error) fails the property. */
async function refusedOrDone<T>(
  work: Promise<T>,
  allowed = [403, 404, 409, 422],
): Promise<{ ok: true; value: T } | { ok: false; status: number }> {
  try {
    return { ok: true, value: await work };
  } catch (error) {
    if (error instanceof AppError && allowed.includes(error.status)) return { ok: false, status: error.status };
    throw error;
  }
}

const guideRow = async (guideId: number) => {
  const [row] = await db.select().from(guides).where(eq(guides.id, guideId));
  return row;
};

async function inReview(guideId: number) {
  const [row] = await db
    .select({ id: revisions.id })
    .from(revisions)
    .where(and(eq(revisions.guideId, guideId), eq(revisions.state, "in-review")));
  return row?.id ?? null;
}

/** Independently of the model functions: whether every caution of the revision carries a sign-off for its exact words. */
async function unsignedCautions(revisionId: number, guideId: number) {
  const [revision] = await db.select().from(revisions).where(eq(revisions.id, revisionId));
  const own = await db
    .select({ id: callouts.id, data: callouts.data, signed: cautionSignoffs.id, signer: cautionSignoffs.editorId })
    .from(callouts)
    .innerJoin(steps, eq(steps.id, callouts.stepId))
    .leftJoin(cautionSignoffs, eq(cautionSignoffs.calloutId, callouts.id))
    .where(and(eq(steps.revisionId, revisionId), eq(callouts.kind, "caution")));
  const earlierIds = (await db.select().from(revisions).where(eq(revisions.guideId, guideId)))
    .filter((r) => r.number < revision.number)
    .map((r) => r.id);
  const earlier = earlierIds.length
    ? await db
        .select({ wording: cautionSignoffs.wording, signer: cautionSignoffs.editorId })
        .from(cautionSignoffs)
        .innerJoin(callouts, eq(callouts.id, cautionSignoffs.calloutId))
        .innerJoin(steps, eq(steps.id, callouts.stepId))
        .where(inArray(steps.revisionId, earlierIds))
    : [];
  return own.filter((c) => {
    const data = c.data as { signalWord: string; text: string };
    const words = `${data.signalWord}: ${data.text}`;
    const signedHere = c.signed !== null && c.signer !== author.id;
    const carried = earlier.some((e) => e.wording === words && e.signer !== author.id);
    return !signedHere && !carried;
  });
}

const blockingCount = (revisionId: number) =>
  db.$count(findings, and(eq(findings.revisionId, revisionId), eq(findings.severity, "blocking")));

async function readyToApprove(revisionId: number, guideId: number) {
  return (await blockingCount(revisionId)) === 0 && (await unsignedCautions(revisionId, guideId)).length === 0;
}

/** The invariants, after every command. */
async function checkInvariants(model: Model, real: Real) {
  const guide = await guideRow(real.guideId);
  const published = await db
    .select()
    .from(revisions)
    .where(and(eq(revisions.guideId, real.guideId), eq(revisions.state, "published")));
  expect(published.length, "published revisions of one guide").toBeLessThanOrEqual(1);
  if (model.everPublished) {
    expect(guide.publishedRevisionId, "the published revision is kept").toBe(model.lastPublished);
    expect(published.map((r) => r.id)).toEqual([model.lastPublished]);
    expect(guide.state).toBe(model.unpublished ? "unpublished" : "published");
  } else {
    expect(published).toEqual([]);
  }
  for (const r of published) {
    expect(await blockingCount(r.id), "blocking findings on a published revision").toBe(0);
    expect(await unsignedCautions(r.id, real.guideId), "unsigned cautions on a published revision").toEqual([]);
    expect(r.reviewedById).not.toBe(author.id);
  }
}

class Save implements fc.AsyncCommand<Model, Real> {
  constructor(readonly content: Content) {}
  check = () => true;
  async run(model: Model, real: Real) {
    const guide = await guideRow(real.guideId);
    if (!guide.workingRevisionId && guide.publishedRevisionId) await refusedOrDone(startNextRevision(db, real.guideId, author));
    const now = await guideRow(real.guideId);
    const [working] = now.workingRevisionId
      ? await db.select().from(revisions).where(eq(revisions.id, now.workingRevisionId))
      : [];
    const saved = await refusedOrDone(
      saveDraft(db, real.guideId, author, draftWith(this.content, working?.version ?? 1, "Lamps, the workflow property")),
    );
    // A revision with the editors is frozen: the save must be refused, not applied.
    if (working?.state === "in-review") expect(saved.ok).toBe(false);
    await checkInvariants(model, real);
  }
  toString = () => `save(${JSON.stringify(this.content)})`;
}

class Submit implements fc.AsyncCommand<Model, Real> {
  check = () => true;
  async run(model: Model, real: Real) {
    await refusedOrDone(submitRevision(db, real.guideId, author, "Changed the harness"));
    await checkInvariants(model, real);
  }
  toString = () => "submit";
}

class SignOff implements fc.AsyncCommand<Model, Real> {
  /** A bit per caution, in order; "all" signs every one. */
  constructor(readonly which: number | "all") {}
  check = () => true;
  async run(model: Model, real: Real) {
    const revisionId = await inReview(real.guideId);
    if (revisionId) {
      const cautions = await revisionCautions(db, revisionId);
      const chosen = cautions.filter((_, i) => this.which === "all" || (this.which >> i) & 1);
      for (const c of chosen) await refusedOrDone(signOffCaution(db, revisionId, editor, { cautionId: c.id }));
      // The author can never sign off their own caution.
      if (cautions[0])
        expect((await refusedOrDone(signOffCaution(db, revisionId, author, { cautionId: cautions[0].id }))).ok).toBe(false);
    }
    await checkInvariants(model, real);
  }
  toString = () => `sign-off(${this.which === "all" ? "all" : this.which.toString(2)})`;
}

/** A blocking finding stored with the revision under review (as after a rule change): approval must still refuse it. */
class StoredBlocking implements fc.AsyncCommand<Model, Real> {
  check = () => true;
  async run(model: Model, real: Real) {
    const revisionId = await inReview(real.guideId);
    if (revisionId) {
      await db.insert(findings).values({
        revisionId,
        rule: "support-caution-missing",
        severity: "blocking",
        stepIndex: 0,
        message: "Step 1 lifts the vehicle but carries no caution about supporting it on stands.",
      });
    }
    await checkInvariants(model, real);
  }
  toString = () => "stored-blocking";
}

class RequestChanges implements fc.AsyncCommand<Model, Real> {
  check = () => true;
  async run(model: Model, real: Real) {
    const revisionId = await inReview(real.guideId);
    if (revisionId) {
      const sent = await refusedOrDone(requestChanges(db, revisionId, editor, { note: "Name the relay terminals, please." }));
      expect(sent.ok).toBe(true);
      reached.sentBack++;
    }
    await checkInvariants(model, real);
  }
  toString = () => "request-changes";
}

async function approveAndRecord(model: Model, real: Real, by: User[]) {
  const revisionId = await inReview(real.guideId);
  const ready = revisionId ? await readyToApprove(revisionId, real.guideId) : false;
  const target = revisionId ?? (await guideRow(real.guideId)).workingRevisionId ?? 0;
  const results = await Promise.all(by.map((who) => refusedOrDone(approveRevision(db, target, who))));
  const wins = results.filter((r) => r.ok).length;
  expect(wins, "approvals that went through").toBe(revisionId && ready ? 1 : 0);
  if (revisionId && !ready) reached.refusedApproval++;
  if (wins) reached.published++;
  if (wins) {
    model.everPublished = true;
    model.lastPublished = revisionId;
    model.unpublished = false;
  }
}

class Approve implements fc.AsyncCommand<Model, Real> {
  constructor(readonly who: "editor" | "author") {}
  check = () => true;
  async run(model: Model, real: Real) {
    if (this.who === "author") {
      const target = (await inReview(real.guideId)) ?? (await guideRow(real.guideId)).workingRevisionId;
      if (target) expect(await refusedOrDone(approveRevision(db, target, author))).toEqual({ ok: false, status: 403 });
    } else {
      await approveAndRecord(model, real, [editor]);
    }
    await checkInvariants(model, real);
  }
  toString = () => `approve(${this.who})`;
}

class ApproveTwice implements fc.AsyncCommand<Model, Real> {
  check = () => true;
  async run(model: Model, real: Real) {
    await approveAndRecord(model, real, [editor, secondEditor]);
    await checkInvariants(model, real);
  }
  toString = () => "approve ∥ approve";
}

class ApproveWhileEditing implements fc.AsyncCommand<Model, Real> {
  constructor(readonly content: Content) {}
  check = () => true;
  async run(model: Model, real: Real) {
    const guide = await guideRow(real.guideId);
    const [working] = guide.workingRevisionId
      ? await db.select().from(revisions).where(eq(revisions.id, guide.workingRevisionId))
      : [];
    const revisionId = await inReview(real.guideId);
    const ready = revisionId ? await readyToApprove(revisionId, real.guideId) : false;
    const [approved, saved] = await Promise.all([
      refusedOrDone(approveRevision(db, revisionId ?? working?.id ?? 0, editor)),
      refusedOrDone(
        saveDraft(db, real.guideId, author, draftWith(this.content, working?.version ?? 1, "Lamps, edited meanwhile")),
      ),
    ]);
    expect(approved.ok).toBe(!!revisionId && ready);
    if (working?.state === "in-review") expect(saved.ok).toBe(false);
    if (approved.ok) {
      model.everPublished = true;
      model.lastPublished = revisionId;
      model.unpublished = false;
    }
    await checkInvariants(model, real);
  }
  toString = () => `approve ∥ save(${JSON.stringify(this.content)})`;
}

class Unpublish implements fc.AsyncCommand<Model, Real> {
  check = () => true;
  async run(model: Model, real: Real) {
    const guide = await guideRow(real.guideId);
    if (guide.publishedRevisionId) {
      const done = await refusedOrDone(
        unpublishGuide(db, guide.publishedRevisionId, editor, { reason: "Withdrawn while the bracket is checked." }),
      );
      expect(done.ok).toBe(guide.state === "published");
      if (done.ok) {
        model.unpublished = true;
        reached.unpublished++;
      }
    }
    await checkInvariants(model, real);
  }
  toString = () => "unpublish";
}

const content = fc.record({ oversizedFuse: fc.boolean(), reword: fc.integer({ min: 0, max: 2 }), extraStep: fc.boolean() });

// Submitting, signing and approving come up more often than the rest, so runs get as far as publishing.
const commands = fc.commands(
  [
    content.map((c) => new Save(c)),
    fc.constant(new Submit()),
    fc.constant(new Submit()),
    fc.constant(new SignOff("all")),
    fc.integer({ min: 0, max: 255 }).map((n) => new SignOff(n)),
    fc.constant(new Approve("editor")),
    fc.constant(new StoredBlocking()),
    fc.constant(new RequestChanges()),
    fc.constantFrom(new Approve("editor"), new Approve("author")),
    fc.constant(new ApproveTwice()),
    content.map((c) => new ApproveWhileEditing(c)),
    fc.constant(new Unpublish()),
    fc.constant(new Unpublish()),
  ],
  { maxCommands: 16, size: "large" },
);

describe("the review workflow", () => {
  it("never publishes a blocking finding or an unsigned caution, never loses or doubles the published revision, never lets an author approve", async () => {
    let runs = 0;
    await fc.assert(
      fc.asyncProperty(commands, async (cmds) => {
        runs++;
        const created = await createGuide(db, author, {
          title: `Lamps, workflow run ${runs}`,
          summary: base.summary,
          category: base.category,
          difficulty: base.difficulty,
          minutes: base.minutes,
        });
        await saveDraft(db, created.id, author, draftWith({ oversizedFuse: false, reword: 0, extraStep: false }, 1, "Lamps"));
        await fc.asyncModelRun(
          () => ({ model: { everPublished: false, lastPublished: null, unpublished: false }, real: { guideId: created.id } }),
          cmds,
        );
      }),
      {
        numRuns: 60,
        // Runs given besides the drawn ones, so each state the checks below ask for is reached in
        // every test run, not only when the draw happens to get there (60 draws once reached no
        // unpublication): an approval refused while cautions wait, the author's refused, publication,
        // unpublication, and a revision sent back.
        examples: [
          [
            [
              new Submit(),
              new Approve("editor"),
              new Approve("author"),
              new SignOff("all"),
              new Approve("editor"),
              new Unpublish(),
            ],
          ],
          [[new Submit(), new RequestChanges()]],
        ],
      },
    );
    expect(reached.published).toBeGreaterThan(0);
    expect(reached.refusedApproval).toBeGreaterThan(0);
    expect(reached.unpublished).toBeGreaterThan(0);
    expect(reached.sentBack).toBeGreaterThan(0);
  }, 240_000);

  it("reaches publication and unpublication in its runs (the property is not vacuous)", async () => {
    // A fixed sequence through the same commands: save, submit, sign everything, approve, unpublish.
    const created = await createGuide(db, author, { ...base, title: "Lamps, the straight path" });
    await saveDraft(db, created.id, author, draftWith({ oversizedFuse: false, reword: 0, extraStep: false }, 1, "Lamps"));
    const model: Model = { everPublished: false, lastPublished: null, unpublished: false };
    const real = { guideId: created.id };
    for (const cmd of [new Submit(), new SignOff("all"), new ApproveTwice(), new Unpublish()]) await cmd.run(model, real);
    expect(model).toMatchObject({ everPublished: true, unpublished: true });
  });
});

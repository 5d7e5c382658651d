import { type Client, createClient, type Transaction } from "@libsql/client";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { useTestDatabase } from "../support/base-db";

// Raw SQL straight at a copy of the demo database: the freeze must hold for any writer, not only
// for the app's model functions. docs/decisions/0003-revision-model.md lists what is enforced.

let client: Client;

beforeAll(async () => {
  const file = useTestDatabase("revision-frozen");
  client = createClient({ url: `file:${file}` });
  await client.execute("PRAGMA foreign_keys = ON");
});

afterAll(() => client.close());

/** Runs `fn` in a transaction that is always rolled back, so every test starts from the demo data. */
async function inRollback(fn: (tx: Transaction) => Promise<void>) {
  const tx = await client.transaction("write");
  try {
    await fn(tx);
  } finally {
    await tx.rollback();
  }
}

async function revisionOf(slug: string, state: string) {
  const rs = await client.execute({
    sql: "SELECT r.id FROM revisions r JOIN guides g ON g.id = r.guide_id WHERE g.slug = ? AND r.state = ?",
    args: [slug, state],
  });
  const id = Number(rs.rows[0]?.id);
  if (!id) throw new Error(`demo revision ${slug} (${state}) is missing`);
  return id;
}

// The demo's in-review, published and draft revisions each have rows in every child table.
const IN_REVIEW = () => revisionOf("fjell-phev-rear-usb-charger", "in-review");
const PUBLISHED = () => revisionOf("kestrel-hood-auxiliary-lamps", "published");
const DRAFT = () => revisionOf("fjell-f3-hardwired-dash-camera", "draft");

type Child = {
  table: string;
  /** Rows of the revision, by id. */
  rowsOf: string;
  /** A real change to one row (`?` is its id). */
  update: string;
};

const CHILDREN: Child[] = [
  {
    table: "steps",
    rowsOf: "SELECT id FROM steps WHERE revision_id = ?",
    update: "UPDATE steps SET title = title || ' (edited)' WHERE id = ?",
  },
  {
    table: "callouts",
    rowsOf: "SELECT c.id FROM callouts c JOIN steps s ON s.id = c.step_id WHERE s.revision_id = ?",
    update: "UPDATE callouts SET position = position + 100 WHERE id = ?",
  },
  {
    table: "step_photos",
    rowsOf: "SELECT p.id FROM step_photos p JOIN steps s ON s.id = p.step_id WHERE s.revision_id = ?",
    update: "UPDATE step_photos SET alt = alt || ' (edited)' WHERE id = ?",
  },
  {
    table: "fitment",
    rowsOf: "SELECT id FROM fitment WHERE revision_id = ?",
    update: "UPDATE fitment SET note = coalesce(note, '') || ' (edited)' WHERE id = ?",
  },
  {
    table: "parts",
    rowsOf: "SELECT id FROM parts WHERE revision_id = ?",
    update: "UPDATE parts SET quantity = quantity + 1 WHERE id = ?",
  },
  {
    table: "tools",
    rowsOf: "SELECT id FROM tools WHERE revision_id = ?",
    update: "UPDATE tools SET name = name || ' (edited)' WHERE id = ?",
  },
];

async function firstRow(tx: Transaction, child: Child, revisionId: number) {
  const rs = await tx.execute({ sql: child.rowsOf, args: [revisionId] });
  const id = Number(rs.rows[0]?.id);
  if (!id) throw new Error(`revision ${revisionId} has no ${child.table}`);
  return id;
}

async function rowText(tx: Transaction, table: string, id: number) {
  const rs = await tx.execute({ sql: `SELECT * FROM ${table} WHERE id = ?`, args: [id] });
  return JSON.stringify(rs.rows[0] ?? null);
}

/**
 * A copy of one row under a new id, built from PRAGMA table_info so it covers every column.
 * Positions move out of the way of unique indexes; a fitment copy names a variant not yet listed.
 */
async function duplicateRow(tx: Transaction, table: string, id: number) {
  const columns = (await tx.execute(`PRAGMA table_info(${table})`)).rows.map((r) => String(r.name)).filter((n) => n !== "id");
  const values = columns.map((name) => {
    if (name === "position") return "position + 1000";
    if (table === "fitment" && name === "variant_id") {
      return `(SELECT min(v.id) FROM variants v WHERE v.id NOT IN (SELECT variant_id FROM fitment WHERE revision_id = t.revision_id))`;
    }
    return name;
  });
  return tx.execute({
    sql: `INSERT INTO ${table} (${columns.join(", ")}) SELECT ${values.join(", ")} FROM ${table} t WHERE t.id = ?`,
    args: [id],
  });
}

const count = async (tx: Transaction, sql: string, args: number[]) =>
  Number((await tx.execute({ sql: `SELECT count(*) AS n FROM (${sql})`, args })).rows[0].n);

describe.each([
  ["in-review", IN_REVIEW],
  ["published", PUBLISHED],
])("every child row of a %s revision is frozen", (_state, revision) => {
  it.each(CHILDREN)("$table refuses UPDATE, DELETE and INSERT", async (child) => {
    await inRollback(async (tx) => {
      const revisionId = await revision();
      const id = await firstRow(tx, child, revisionId);
      const before = await rowText(tx, child.table, id);
      const rows = await count(tx, child.rowsOf, [revisionId]);

      await expect(tx.execute({ sql: child.update, args: [id] })).rejects.toThrow(/revision-frozen/);
      await expect(tx.execute({ sql: `DELETE FROM ${child.table} WHERE id = ?`, args: [id] })).rejects.toThrow(/revision-frozen/);
      await expect(duplicateRow(tx, child.table, id)).rejects.toThrow(/revision-frozen/);

      expect(await rowText(tx, child.table, id)).toBe(before);
      expect(await count(tx, child.rowsOf, [revisionId])).toBe(rows);
    });
  });
});

describe("every child row of a draft stays editable", () => {
  it.each(CHILDREN)("$table accepts UPDATE, DELETE and INSERT", async (child) => {
    await inRollback(async (tx) => {
      const revisionId = await DRAFT();
      const id = await firstRow(tx, child, revisionId);
      const before = await rowText(tx, child.table, id);
      const rows = await count(tx, child.rowsOf, [revisionId]);

      await tx.execute({ sql: child.update, args: [id] });
      expect(await rowText(tx, child.table, id)).not.toBe(before);
      await duplicateRow(tx, child.table, id);
      expect(await count(tx, child.rowsOf, [revisionId])).toBe(rows + 1);
      await tx.execute({ sql: `DELETE FROM ${child.table} WHERE id = ?`, args: [id] });
      expect(await count(tx, child.rowsOf, [revisionId])).toBe(rows);
    });
  });
});

describe("a child row cannot be moved into or out of a frozen revision", () => {
  it("refuses moving a draft's rows onto a submitted revision", async () => {
    await inRollback(async (tx) => {
      const draft = await DRAFT();
      const frozen = await IN_REVIEW();
      const tool = await firstRow(tx, CHILDREN[5], draft);
      await expect(tx.execute({ sql: "UPDATE tools SET revision_id = ? WHERE id = ?", args: [frozen, tool] })).rejects.toThrow(
        /revision-frozen/,
      );
      const frozenStep = Number(
        (await tx.execute({ sql: "SELECT id FROM steps WHERE revision_id = ? LIMIT 1", args: [frozen] })).rows[0].id,
      );
      const callout = await firstRow(tx, CHILDREN[1], draft);
      await expect(
        tx.execute({ sql: "UPDATE callouts SET step_id = ? WHERE id = ?", args: [frozenStep, callout] }),
      ).rejects.toThrow(/revision-frozen/);
    });
  });

  it("refuses moving a submitted revision's rows onto a draft", async () => {
    await inRollback(async (tx) => {
      const draft = await DRAFT();
      const part = await firstRow(tx, CHILDREN[4], await PUBLISHED());
      await expect(tx.execute({ sql: "UPDATE parts SET revision_id = ? WHERE id = ?", args: [draft, part] })).rejects.toThrow(
        /revision-frozen/,
      );
    });
  });
});

describe("the revision row", () => {
  const update = (tx: Transaction, set: string, id: number) =>
    tx.execute({ sql: `UPDATE revisions SET ${set} WHERE id = ?`, args: [id] });

  it("refuses content, identity and bookkeeping changes once submitted", async () => {
    for (const revisionId of [await IN_REVIEW(), await PUBLISHED()]) {
      for (const set of [
        "title = title || ' (edited)'",
        "summary = ''",
        "minutes = minutes + 5",
        "version = version + 1",
        "change_summary = 'rewritten afterwards'",
        "submitted_at = 1",
        "number = number + 50",
        "created_by_id = created_by_id",
        "reviewed_at = 1",
        "published_at = 1",
        "updated_at = 1",
        "state = 'draft'",
      ]) {
        await inRollback(async (tx) => {
          await expect(update(tx, set, revisionId), set).rejects.toThrow(/revision-frozen/);
        });
      }
    }
  });

  it("accepts the three review transitions, with their bookkeeping", async () => {
    await inRollback(async (tx) => {
      const id = await IN_REVIEW();
      await update(tx, "state = 'changes-requested', reviewed_at = 5, reviewed_by_id = 1, updated_at = 5", id);
      expect((await tx.execute({ sql: "SELECT state FROM revisions WHERE id = ?", args: [id] })).rows[0].state).toBe(
        "changes-requested",
      );
      // changes-requested is final for this revision: the author works on a copy.
      await expect(update(tx, "state = 'in-review'", id)).rejects.toThrow(/revision-frozen/);
      await expect(update(tx, "state = 'published', published_at = 6", id)).rejects.toThrow(/revision-frozen/);
    });
    await inRollback(async (tx) => {
      const id = await IN_REVIEW();
      await update(tx, "state = 'published', reviewed_at = 5, reviewed_by_id = 1, published_at = 5", id);
      await update(tx, "state = 'superseded'", id);
      await expect(update(tx, "state = 'published'", id)).rejects.toThrow(/revision-frozen/);
    });
  });

  it("refuses a transition that skips its bookkeeping or changes content on the way", async () => {
    const id = await IN_REVIEW();
    for (const set of [
      "state = 'changes-requested'",
      "state = 'published', reviewed_at = 5, reviewed_by_id = 1",
      "state = 'changes-requested', reviewed_at = 5, reviewed_by_id = 1, published_at = 5",
      "state = 'published', reviewed_at = 5, reviewed_by_id = 1, published_at = 5, title = 'Swapped at approval'",
      "state = 'superseded'",
    ]) {
      await inRollback(async (tx) => {
        await expect(update(tx, set, id), set).rejects.toThrow(/revision-frozen/);
      });
    }
    await inRollback(async (tx) => {
      const published = await PUBLISHED();
      await expect(update(tx, "state = 'superseded', reviewed_by_id = reviewed_by_id + 1", published)).rejects.toThrow(
        /revision-frozen/,
      );
    });
  });

  it("lets a draft change its content and be submitted, but not skip review", async () => {
    const id = await DRAFT();
    await inRollback(async (tx) => {
      await update(tx, "title = 'Hardwired dash camera, revised', version = version + 1", id);
      await update(tx, "state = 'in-review', submitted_at = 5, change_summary = 'First version'", id);
      await expect(update(tx, "title = 'Too late'", id)).rejects.toThrow(/revision-frozen/);
    });
    for (const set of [
      "state = 'published', reviewed_at = 5, reviewed_by_id = 1, published_at = 5",
      "state = 'in-review'",
      "reviewed_by_id = 1",
      "guide_id = guide_id + 1",
    ]) {
      await inRollback(async (tx) => {
        await expect(update(tx, set, id), set).rejects.toThrow(/revision-frozen/);
      });
    }
  });

  it("is born a draft", async () => {
    await inRollback(async (tx) => {
      const insert = (state: string, number: number) =>
        tx.execute({
          sql: `INSERT INTO revisions (guide_id, number, state, title, category, difficulty, minutes, created_by_id)
            SELECT guide_id, ?, ?, title, category, difficulty, minutes, created_by_id FROM revisions WHERE id = ?`,
          args: [number, state, 1],
        });
      await expect(insert("published", 90)).rejects.toThrow(/revision-frozen/);
      await expect(insert("in-review", 91)).rejects.toThrow(/revision-frozen/);
      await insert("draft", 92);
    });
  });

  it("refuses DELETE once submitted, and a draft can be thrown away with its rows", async () => {
    for (const id of [await IN_REVIEW(), await PUBLISHED()]) {
      await inRollback(async (tx) => {
        await expect(tx.execute({ sql: "DELETE FROM revisions WHERE id = ?", args: [id] })).rejects.toThrow(/revision-frozen/);
      });
    }
    await inRollback(async (tx) => {
      const id = await DRAFT();
      await tx.execute({ sql: "DELETE FROM revisions WHERE id = ?", args: [id] });
      expect(await count(tx, "SELECT id FROM steps WHERE revision_id = ?", [id])).toBe(0);
    });
  });
});

describe("the review's own records stay writable on a submitted revision", () => {
  it("findings can be acknowledged and caution sign-offs recorded", async () => {
    await inRollback(async (tx) => {
      const id = await IN_REVIEW();
      await tx.execute({
        sql: "UPDATE findings SET status = 'acknowledged', resolved_by_id = 2, resolved_at = 5, note = 'checked' WHERE revision_id = ?",
        args: [id],
      });
      expect(await count(tx, "SELECT id FROM findings WHERE revision_id = ? AND status = 'acknowledged'", [id])).toBeGreaterThan(
        0,
      );
      const callout = Number(
        (
          await tx.execute({
            sql: "SELECT c.id FROM callouts c JOIN steps s ON s.id = c.step_id WHERE s.revision_id = ? AND c.kind = 'caution' LIMIT 1",
            args: [id],
          })
        ).rows[0].id,
      );
      await tx.execute({ sql: "INSERT INTO caution_signoffs (callout_id, editor_id) VALUES (?, 2)", args: [callout] });
      await tx.execute({ sql: "DELETE FROM caution_signoffs WHERE callout_id = ?", args: [callout] });
    });
  });
});

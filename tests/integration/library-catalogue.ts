import { sql } from "drizzle-orm";
import type { Db } from "~/db/client.server";
import { CATEGORIES, DRIVETRAINS, POWERTRAINS } from "~/utils/vocab";
import { seededRandom } from "../support/seeded-random";

/**
 * A generated catalogue for the Library's scale tests, written straight into a test database by
 * the SQL the model functions produce (bench/data.ts writes the same through them, in minutes):
 * makes, models, generations and variants, then guides with one published revision each, a step of
 * text, fitment rows (some "does not fit") and readers' fitment reports (some hidden), in big
 * multi-row statements inside one transaction per table. The revisions are written as drafts and
 * then submitted and published, as the frozen-revision triggers require, and the search index is
 * filled by the migrations' own triggers. Names are invented; the output depends only on the seed.
 */

const quote = (s: string) => `'${s.replace(/'/g, "''")}'`;

const WORDS = [
  "harness",
  "bracket",
  "relay",
  "grommet",
  "loom",
  "socket",
  "clamp",
  "lamp",
  "crossbar",
  "panel",
  "fuse",
  "switch",
];

/** The planted word of one guide in a hundred, so a search's total can be counted in the test. */
export const RARE_WORD = "quillfern";
export const isRare = (i: number) => i % 100 === 3;
/** One guide's title holds markup and quotes, to check the search's highlighting escapes them. */
export const HOSTILE_TITLE = `<script>alert("x")</script> & 'quoted' ${RARE_WORD} <b>bold</b>`;

async function inBatches(db: Db, rows: string[], head: string, size = 500) {
  const statements = [];
  for (let i = 0; i < rows.length; i += size)
    statements.push(db.run(sql.raw(`${head} VALUES ${rows.slice(i, i + size).join(",")}`)));
  if (statements.length) await db.batch(statements as [(typeof statements)[0], ...typeof statements]);
}

export async function writeCatalogue(db: Db, options: { guides: number; fitmentPerGuide: number; reports: number }) {
  const random = seededRandom(13);
  const int = (min: number, max: number) => min + Math.floor(random() * (max - min + 1));
  const tag = `scale${Date.now().toString(36)}`;
  const [author] = await db.all<{ id: number }>(sql`SELECT id FROM users WHERE email = 'author@torqueleaf.test'`);
  const [editor] = await db.all<{ id: number }>(sql`SELECT id FROM users WHERE email = 'editor@torqueleaf.test'`);

  // The catalogue: 12 makes × 4 models × 3 generations × every powertrain/drivetrain pairing used.
  const makes = Array.from({ length: 12 }, (_, m) => `${tag}m${m}`);
  await inBatches(
    db,
    makes.map((slug, m) => `(${quote(slug)}, ${quote(`Make ${m}`)})`),
    "INSERT INTO makes (slug, name)",
  );
  await db.run(
    sql.raw(`INSERT INTO models (make_id, slug, name)
    SELECT mk.id, 'mo' || n.k, 'Model ' || n.k FROM makes mk
    JOIN (SELECT 0 AS k UNION ALL SELECT 1 UNION ALL SELECT 2 UNION ALL SELECT 3) n WHERE mk.slug LIKE '${tag}%'`),
  );
  await db.run(
    sql.raw(`INSERT INTO generations (model_id, slug, name, first_year, last_year)
    SELECT mo.id, 'g' || n.k, 'G' || n.k, 2004 + n.k * 7 + mo.id % 3, CASE WHEN n.k = 2 THEN NULL ELSE 2004 + n.k * 7 + mo.id % 3 + 7 END
    FROM models mo JOIN makes mk ON mk.id = mo.make_id
    JOIN (SELECT 0 AS k UNION ALL SELECT 1 UNION ALL SELECT 2) n WHERE mk.slug LIKE '${tag}%'`),
  );
  const pairs = POWERTRAINS.flatMap((p, i) =>
    [DRIVETRAINS[i % DRIVETRAINS.length], DRIVETRAINS[(i + 1) % DRIVETRAINS.length]].map((d) => [p, d]),
  );
  const generations = await db.all<{ id: number }>(
    sql.raw(`SELECT gen.id FROM generations gen JOIN models mo ON mo.id = gen.model_id
    JOIN makes mk ON mk.id = mo.make_id WHERE mk.slug LIKE '${tag}%' ORDER BY gen.id`),
  );
  await inBatches(
    db,
    generations.flatMap((g) =>
      pairs.map(
        ([p, d]) =>
          `(${g.id}, ${quote(`${tag}-${g.id}-${p}-${d}`)}, ${quote(`${p} ${d}`)}, ${quote(p)}, ${quote(d)}, 'engine-bay', 1.5)`,
      ),
    ),
    "INSERT INTO variants (generation_id, key, name, powertrain, drivetrain, battery_location, battery_run_m)",
  );
  const variants = (
    await db.all<{ id: number; generationId: number }>(
      sql.raw(`SELECT v.id, v.generation_id AS generationId FROM variants v
      WHERE v.key LIKE '${tag}-%' ORDER BY v.id`),
    )
  ).map((v) => ({ id: Number(v.id), generationId: Number(v.generationId) }));

  // Guides, then their first revisions as drafts, with a step and the fitment rows.
  const base = Date.UTC(2024, 0, 1);
  const guides = Array.from({ length: options.guides }, (_, i) => {
    const category = CATEGORIES[int(0, CATEGORIES.length - 1)];
    const words = Array.from({ length: 6 }, () => WORDS[int(0, WORDS.length - 1)]);
    return {
      slug: `${tag}-${i}`,
      title: i === 3 ? HOSTILE_TITLE : `Fit a ${words[0]} and ${words[1]} kit ${i}`,
      summary: `Route the ${words[2]} past the ${words[3]}${isRare(i) ? ` beside the ${RARE_WORD}` : ""}.`,
      category,
      difficulty: int(1, 5),
      // Whole quarter hours, so many guides share a time and ties are common.
      minutes: int(1, 32) * 15,
      // Three guides a second: ties on the publication time are broken by id.
      publishedAt: base + Math.floor(i / 3) * 1000,
      step: `Check the ${words[4]} and the ${words[5]} before the trim goes back.`,
    };
  });
  await inBatches(
    db,
    guides.map(
      (g) =>
        `(${quote(g.slug)}, ${author.id}, 'published', ${quote(g.title)}, ${quote(g.summary)}, ${quote(g.category)}, ${g.difficulty}, ${g.minutes}, ${g.publishedAt})`,
    ),
    "INSERT INTO guides (slug, author_id, state, title, summary, category, difficulty, minutes, published_at)",
  );
  const guideIds = await db.all<{ id: number; slug: string }>(sql.raw(`SELECT id, slug FROM guides WHERE slug LIKE '${tag}-%'`));
  const idOf = new Map(guideIds.map((g) => [g.slug, Number(g.id)]));
  await inBatches(
    db,
    guides.map(
      (g) =>
        `(${idOf.get(g.slug)}, 1, 'draft', ${quote(g.title)}, ${quote(g.summary)}, ${quote(g.category)}, ${g.difficulty}, ${g.minutes}, ${author.id})`,
    ),
    "INSERT INTO revisions (guide_id, number, state, title, summary, category, difficulty, minutes, created_by_id)",
  );
  const revisionRows = await db.all<{ id: number; guideId: number }>(
    sql.raw(`SELECT r.id, r.guide_id AS guideId FROM revisions r
    JOIN guides g ON g.id = r.guide_id WHERE g.slug LIKE '${tag}-%'`),
  );
  const revisionOf = new Map(revisionRows.map((r) => [Number(r.guideId), Number(r.id)]));
  await inBatches(
    db,
    guides.map((g) => {
      const revision = revisionOf.get(idOf.get(g.slug) ?? -1);
      return `(${revision}, 0, 'Check the parts', '{}', ${quote(`<p>${g.step}</p>`)}, ${quote(g.step)})`;
    }),
    "INSERT INTO steps (revision_id, position, title, body, body_html, body_text)",
  );
  const fitmentRows: string[] = [];
  for (const g of guides) {
    const revision = revisionOf.get(idOf.get(g.slug) ?? -1);
    const home = variants[int(0, variants.length - 1)].generationId;
    const chosen = new Set<number>();
    const sameGeneration = variants.filter((v) => v.generationId === home);
    while (chosen.size < Math.min(2, sameGeneration.length)) chosen.add(sameGeneration[int(0, sameGeneration.length - 1)].id);
    while (chosen.size < options.fitmentPerGuide) chosen.add(variants[int(0, variants.length - 1)].id);
    for (const variant of chosen) {
      const roll = random();
      const status = roll < 0.7 ? "fits" : roll < 0.85 ? "fits-with-changes" : "does-not-fit";
      fitmentRows.push(`(${revision}, ${variant}, '${status}', ${status === "fits" ? "NULL" : quote("Trim the clip")})`);
    }
  }
  await inBatches(db, fitmentRows, "INSERT INTO fitment (revision_id, variant_id, status, note)", 2000);
  const now = Date.now();
  await db.run(
    sql.raw(`UPDATE revisions SET state = 'in-review', submitted_at = ${now}
    WHERE id IN (SELECT r.id FROM revisions r JOIN guides g ON g.id = r.guide_id WHERE g.slug LIKE '${tag}-%')`),
  );
  await db.run(
    sql.raw(`UPDATE revisions SET state = 'published', reviewed_at = ${now}, reviewed_by_id = ${editor.id},
      published_at = (SELECT published_at FROM guides g WHERE g.id = revisions.guide_id)
    WHERE id IN (SELECT r.id FROM revisions r JOIN guides g ON g.id = r.guide_id WHERE g.slug LIKE '${tag}-%')`),
  );
  await db.run(
    sql.raw(`UPDATE guides SET published_revision_id = (SELECT r.id FROM revisions r WHERE r.guide_id = guides.id)
    WHERE slug LIKE '${tag}-%'`),
  );

  // Readers and their reports: one per reader, variant and guide; one in eight hidden by an editor.
  const readers = Array.from({ length: 40 }, (_, n) => `${tag}-reader${n}@torqueleaf.test`);
  await inBatches(
    db,
    readers.map((email, n) => `(${quote(email)}, ${quote(`Reader ${n}`)})`),
    "INSERT INTO users (email, name)",
  );
  const readerIds = (await db.all<{ id: number }>(sql.raw(`SELECT id FROM users WHERE email LIKE '${tag}-reader%'`))).map((r) =>
    Number(r.id),
  );
  const reports = new Map<string, string>();
  // Reports go to the first thousand guides mostly, so some guides have many and the order has ties.
  while (reports.size < options.reports) {
    const g = random() < 0.8 ? int(0, Math.min(999, guides.length - 1)) : int(0, guides.length - 1);
    const guideId = idOf.get(guides[g].slug);
    const user = readerIds[int(0, readerIds.length - 1)];
    const variant = variants[int(0, variants.length - 1)].id;
    const roll = random();
    const status = roll < 0.6 ? "fits" : roll < 0.8 ? "fits-with-changes" : "does-not-fit";
    const hidden = random() < 0.125;
    reports.set(
      `${guideId}.${user}.${variant}`,
      `(${guideId}, ${variant}, ${user}, '${status}', ${hidden ? `${now}, ${quote("off-topic")}` : "NULL, NULL"})`,
    );
  }
  await inBatches(
    db,
    [...reports.values()],
    "INSERT INTO fitment_reports (guide_id, variant_id, user_id, status, hidden_at, hidden_reason)",
    2000,
  );
  return { tag, variants };
}

/**
 * `npm run bench:data -- --guides 20000 --db PATH [--fitment 5] [--force]`: writes a migrated
 * database for the scale benchmark. Everything goes through the app's model functions, exactly as
 * an author and an editor would: the catalogue through `upsertCatalogue`, each guide through
 * `createGuide`, `saveDraft` (one batch per guide: steps rendered to HTML, fitment, parts, tools),
 * `submitRevision` and `approveRevision`, and the search index is filled by the migrations' own
 * triggers as each row is written (each finds its index row by rowid, so about 25 ms a guide, some
 * nine minutes for 20,000 on two cores). Names are invented: a generated catalogue of makes, models,
 * generations and variants, and guide text assembled from a small vocabulary.
 *
 * The work database lives on tmpfs (/dev/shm) while it is written, where a commit's fsync costs
 * nothing, and is then written compacted to PATH with VACUUM INTO. The output is deterministic for
 * a given --guides and --fitment. Two planted words help the search benchmark: "harness" appears in
 * every guide, "snowlatch" in one guide in a thousand.
 */
import { existsSync, mkdirSync, mkdtempSync, rmSync } from "node:fs";
import { tmpdir } from "node:os";
import { dirname, join, resolve } from "node:path";
import { sql } from "drizzle-orm";
import { configure, createDb, migrateDb } from "~/db/client.server";
import { type CatalogueInput, upsertCatalogue } from "~/models/catalogue.server";
import { draftInputSchema } from "~/models/guide-input";
import { createGuide, saveDraft } from "~/models/guides.server";
import { approveRevision, submitRevision } from "~/models/review.server";
import { createUser } from "~/models/users.server";
import { CATEGORIES, type Category } from "~/utils/vocab";
import { ROOT } from "./servers";
import { seededRandom } from "../tests/support/seeded-random";
import { option } from "./stats";

const args = process.argv.slice(2);
const guideCount = Number(option(args, "guides") ?? 20_000);
const fitmentPerGuide = Number(option(args, "fitment") ?? 5);
const target = option(args, "db");
if (!target || !Number.isInteger(guideCount) || guideCount < 1 || !Number.isInteger(fitmentPerGuide) || fitmentPerGuide < 1) {
  console.error("usage: npm run bench:data -- --guides 20000 --db PATH [--fitment 5] [--force]");
  process.exit(2);
}
const output = resolve(target);
if (existsSync(output) && !args.includes("--force")) {
  console.error(`${output} exists: pass --force to replace it`);
  process.exit(2);
}

const random = seededRandom(20_000);
const int = (min: number, max: number) => min + Math.floor(random() * (max - min + 1));
const pick = <T>(items: readonly T[]): T => items[Math.floor(random() * items.length)];
const slug = (s: string) => s.toLowerCase().replace(/[^a-z0-9]+/g, "-");

// ── An invented catalogue ─────────────────────────────────────────
const MAKES = [
  "Arvane",
  "Belmirth",
  "Corrisk",
  "Dunvale",
  "Elskor",
  "Fennow",
  "Galdrin",
  "Holvik",
  "Istrane",
  "Jorlund",
  "Kelbrin",
  "Lunmarr",
  "Morwick",
  "Nelstra",
  "Orvenne",
  "Pellock",
];
const MODELS = [
  "Tarn",
  "Cinder",
  "Heron",
  "Quarry",
  "Marten",
  "Solace",
  "Bramble",
  "Drover",
  "Kestle",
  "Wren",
  "Sable",
  "Fathom",
];
const BODIES = ["hatchback", "estate", "SUV", "pickup", "van"];
const VARIANTS = [
  { name: "1.6 petrol FWD", powertrain: "gas", drivetrain: "FWD", batteryLocation: "engine-bay", batteryRunM: 1.2 },
  { name: "2.0 petrol AWD", powertrain: "gas", drivetrain: "AWD", batteryLocation: "engine-bay", batteryRunM: 1.4 },
  { name: "2.2 diesel 4WD", powertrain: "diesel", drivetrain: "4WD", batteryLocation: "engine-bay", batteryRunM: 1.5 },
  { name: "2.0 hybrid AWD", powertrain: "hybrid", drivetrain: "AWD", batteryLocation: "cargo-area", batteryRunM: 4.6 },
  {
    name: "2.5 plug-in hybrid AWD",
    powertrain: "plug-in-hybrid",
    drivetrain: "AWD",
    batteryLocation: "cargo-area",
    batteryRunM: 4.9,
  },
  { name: "electric RWD", powertrain: "electric", drivetrain: "RWD", batteryLocation: "under-seat", batteryRunM: 3.1 },
] as const;
const GENERATIONS = 3;
const MODELS_PER_MAKE = 5;

function catalogue(): CatalogueInput {
  return {
    makes: MAKES.map((make, m) => ({
      name: make,
      slug: slug(make),
      models: Array.from({ length: MODELS_PER_MAKE }, (_, k) => {
        const model = MODELS[(m + k * 2) % MODELS.length];
        return {
          name: model,
          slug: slug(model),
          bodyStyle: BODIES[(m + k) % BODIES.length],
          generations: Array.from({ length: GENERATIONS }, (_, g) => {
            const firstYear = 2000 + ((m + k) % 4) + g * 8;
            return {
              name: `S${g + 1}`,
              slug: `s${g + 1}`,
              firstYear,
              lastYear: g === GENERATIONS - 1 ? null : firstYear + 7,
              variants: VARIANTS.map((v) => ({ ...v, key: `${slug(make)}-${slug(model)}-s${g + 1}-${slug(v.name)}` })),
            };
          }),
        };
      }),
    })),
  };
}

// ── Guide text from a small vocabulary ────────────────────────────
const ACCESSORIES: Record<Category, string[]> = {
  lighting: ["auxiliary driving lamps", "a rear work lamp", "a light bar on the roof bars", "puddle lamps", "a cargo-area lamp"],
  power: [
    "a second battery",
    "a dash USB-C charger",
    "a 12 V socket in the cargo area",
    "an inverter",
    "a fused accessory panel",
  ],
  racks: ["roof crossbars", "a roof basket", "a tow-bar bike carrier", "a ladder rack", "a rooftop box"],
  protection: ["a front skid plate", "sill guards", "a rear step guard", "mud flaps", "headlamp guards"],
  recovery: ["rear recovery points", "a front winch plate", "a hitch receiver shackle mount", "traction board mounts"],
  electronics: ["a hard-wired dash camera", "a reversing camera", "a tyre pressure monitor", "a two-way radio", "a GPS tracker"],
};
const STEP_TITLES = [
  "Check the parts against the list",
  "Remove the trim panel",
  "Mark and drill the mounting holes",
  "Route the harness along the loom",
  "Fit the bracket",
  "Connect and test",
  "Refit the trim",
  "Check after the first drive",
];
const SENTENCES = [
  "Lay the parts out on a clean sheet and check each one against the list before you start.",
  "Route the harness along the factory loom and keep it clear of hot and moving parts.",
  "Fasten the harness with cable ties every thirty centimetres and trim the tails flush.",
  "Use a plastic trim tool so the clips release without marking the panel.",
  "Deburr every drilled hole and paint the bare metal before the bracket goes on.",
  "Tighten the bracket bolts in a cross pattern to the torque in the parts list.",
  "Check the relay clicks when the switch is pressed and the fuse holder stays cool.",
  "Seal the grommet where the feed passes through the bulkhead.",
  "Photograph the connector before you unplug it so it goes back the same way.",
  "Test every function before the trim goes back on.",
  "Wear eye protection while drilling and vacuum the swarf from the cavity.",
  "Re-check the fasteners after the first fifty kilometres.",
];
const PARTS = [
  "Mounting bracket",
  "M8 flange bolt",
  "Relay, 30 A",
  "Inline fuse holder",
  "Grommet",
  "Cable ties",
  "Loom tape",
  "Switch",
];
const TOOLS = ["Torque wrench", "Trim tool set", "10 mm socket", "Drill and bits", "Multimeter", "Crimping tool", "Heat gun"];

function paragraph(text: string) {
  return { type: "paragraph", content: [{ type: "text", text }] };
}

function stepBody(n: number, rare: boolean) {
  const sentences = Array.from({ length: int(2, 4) }, () => pick(SENTENCES));
  if (rare && n === 0) sentences.push("Keep the snowlatch clear of the new bracket.");
  const content: unknown[] = [paragraph(sentences.join(" "))];
  if (random() < 0.4) {
    content.push({
      type: "bulletList",
      content: [pick(SENTENCES), pick(SENTENCES)].map((text) => ({ type: "listItem", content: [paragraph(text)] })),
    });
  }
  return { type: "doc", content };
}

type VariantRow = { id: number; generationId: number };

function guideInput(i: number, variants: VariantRow[], byGeneration: Map<number, VariantRow[]>, names: Map<number, string>) {
  const category = CATEGORIES[i % CATEGORIES.length];
  const rare = i % 1000 === 7;
  // Fitment clusters on a few generations, as real guides do: most rows on one, the rest on others.
  const rows = new Map<number, VariantRow>();
  const home = pick(variants).generationId;
  for (const v of byGeneration.get(home) ?? []) if (rows.size < Math.ceil(fitmentPerGuide * 0.6)) rows.set(v.id, v);
  while (rows.size < fitmentPerGuide) {
    const v = pick(variants);
    rows.set(v.id, v);
  }
  const vehicle = names.get(home) ?? "";
  const steps = Array.from({ length: int(4, 7) }, (_, n) => ({
    title: STEP_TITLES[(n + i) % STEP_TITLES.length],
    body: stepBody(n, rare),
    liftsVehicle: false,
    disconnectsBattery: category === "power" && n === 0,
    photos: [],
    callouts: random() < 0.3 ? [{ kind: "tip", text: pick(SENTENCES) }] : [],
  }));
  const accessory = pick(ACCESSORIES[category]);
  const title = `${accessory} on the ${vehicle}`.replace(/^./, (c) => c.toUpperCase());
  return {
    slug: `${slug(title).slice(0, 60)}-${i + 1}`,
    meta: {
      title,
      summary: `Fit ${accessory} with the harness routed along the factory loom${rare ? ", clear of the snowlatch" : ""}: parts, torque and checks.`,
      category,
      difficulty: int(1, 5),
      minutes: int(3, 96) * 5,
    },
    steps,
    fitment: [...rows.values()].map((v, n) => ({
      variantId: v.id,
      status: n === 0 || random() < 0.85 ? ("fits" as const) : ("fits-with-changes" as const),
      note: null,
    })),
    parts: Array.from({ length: int(2, 5) }, (_, n) => ({
      name: PARTS[(n + i) % PARTS.length],
      quantity: int(1, 4),
      partNumber: `TL-${(i * 7 + n).toString(36).toUpperCase().padStart(5, "0")}`,
      notes: null,
      stepIndex: n < steps.length ? n : null,
    })),
    tools: Array.from({ length: int(2, 4) }, (_, n) => ({ name: TOOLS[(n + i) % TOOLS.length] })),
  };
}

// ── Writing ───────────────────────────────────────────────────────

const PROGRESS_EVERY = Math.max(100, Math.min(1000, Math.round(guideCount / 20)));
const started = Date.now();
const workDir = mkdtempSync(join(existsSync("/dev/shm") ? "/dev/shm" : tmpdir(), "torqueleaf-bench-data-"));
const workFile = join(workDir, "work.db");
const { client, db } = createDb(`file:${workFile}`);
try {
  await configure(client, `file:${workFile}`);
  await migrateDb(db, join(ROOT, "drizzle"));

  const authors = [];
  for (let n = 1; n <= 40; n++) {
    authors.push(
      await createUser(db, {
        email: `author${n}@bench.torqueleaf.test`,
        name: `Bench author ${n}`,
        password: null,
        role: "author",
        verified: true,
      }),
    );
  }
  const editors = [];
  for (let n = 1; n <= 2; n++) {
    editors.push(
      await createUser(db, {
        email: `editor${n}@bench.torqueleaf.test`,
        name: `Bench editor ${n}`,
        password: null,
        role: "editor",
        verified: true,
      }),
    );
  }
  await upsertCatalogue(db, catalogue());
  const variants = await db.all<VariantRow>(sql`SELECT id, generation_id AS generationId FROM variants ORDER BY id`);
  const byGeneration = new Map<number, VariantRow[]>();
  for (const v of variants) byGeneration.set(v.generationId, [...(byGeneration.get(v.generationId) ?? []), v]);
  const names = new Map(
    (
      await db.all<{ id: number; name: string }>(sql`SELECT gen.id, mk.name || ' ' || mo.name || ' ' || gen.name AS name
        FROM generations gen JOIN models mo ON mo.id = gen.model_id JOIN makes mk ON mk.id = mo.make_id`)
    ).map((r) => [r.id, r.name]),
  );
  console.log(
    `catalogue: ${MAKES.length} makes, ${names.size} generations, ${variants.length} variants; writing ${guideCount} guides…`,
  );

  let lap = Date.now();
  for (let i = 0; i < guideCount; i++) {
    const input = guideInput(i, variants, byGeneration, names);
    const author = authors[i % authors.length];
    const created = await createGuide(db, author, input.meta, { slug: input.slug });
    const draft = draftInputSchema.parse({ ...input.meta, version: created.draft.version, ...input });
    await saveDraft(db, created.id, author, draft);
    const { revisionId } = await submitRevision(db, created.id, author, "First edition");
    await approveRevision(db, revisionId, editors[i % editors.length]);
    if ((i + 1) % PROGRESS_EVERY === 0 || i + 1 === guideCount) {
      const now = Date.now();
      const rate = PROGRESS_EVERY / ((now - lap) / 1000);
      lap = now;
      const eta = (guideCount - i - 1) / rate;
      console.log(
        `  ${i + 1} guides, ${((now - started) / 1000).toFixed(0)} s${i + 1 < guideCount ? `, ~${eta.toFixed(0)} s to go` : ""}`,
      );
    }
  }

  const counts = await db.get<Record<string, number>>(sql`SELECT
    (SELECT count(*) FROM guides WHERE state = 'published') AS guides,
    (SELECT count(*) FROM fitment f JOIN guides g ON g.published_revision_id = f.revision_id) AS fitment,
    (SELECT count(*) FROM steps) AS steps,
    (SELECT count(*) FROM parts) AS parts,
    (SELECT count(*) FROM tools) AS tools,
    (SELECT count(*) FROM variants) AS variants`);
  await db.run(sql`PRAGMA wal_checkpoint(TRUNCATE)`);
  mkdirSync(dirname(output), { recursive: true });
  for (const suffix of ["", "-wal", "-shm"]) rmSync(output + suffix, { force: true });
  await db.run(sql`VACUUM INTO ${output}`);
  console.log(
    `wrote ${output} in ${((Date.now() - started) / 1000).toFixed(0)} s: ` +
      Object.entries(counts ?? {})
        .map(([k, v]) => `${v} ${k}`)
        .join(", "),
  );
} finally {
  client.close();
  rmSync(workDir, { recursive: true, force: true });
}

/**
 * `npm run bench -- --authoring`: the authoring path in-process on a copy of the demo database —
 * the server's time for one autosave of a 40-step guide (goal: median ≤ 50 ms) — and the photo
 * pipeline (bench/photos.ts) beside raw sharp (left out with `--no-photos`).
 */
import { formatMs, formatTable, summarize } from "./stats";
import { photoBench } from "./photos";
import { timeRuns } from "./timing";

/** A long guide as an author would leave it: every step with text, a torque and a circuit callout or a caution. */
function longDraft(version: number, variantId: number, edit = 0) {
  const paragraph = (text: string) => ({ type: "paragraph", content: [{ type: "text", text }] });
  const steps = Array.from({ length: 40 }, (_, i) => ({
    title: `Step ${i + 1}: route and fasten`,
    body: {
      type: "doc",
      content: [
        paragraph(`Lay the harness along the inner fender and fix it every 300 mm with a clip (step ${i + 1}).`),
        // The step an author is typing in: its text differs on every save of the "one step edited" case.
        ...(edit && i === edit % 40 ? [paragraph(`Note ${edit}: check the clip spacing again.`)] : []),
        {
          type: "bulletList",
          content: [{ type: "listItem", content: [paragraph("Keep clear of the exhaust and moving parts.")] }],
        },
      ],
    },
    liftsVehicle: false,
    disconnectsBattery: i === 0,
    photos: [],
    callouts:
      i % 3 === 0
        ? [
            {
              kind: "circuit",
              systemVoltage: 12,
              loadWatts: 60,
              oneWayLengthM: 3,
              returnPath: "chassis",
              wire: { awg: 14 },
              fuseA: 10,
              relay: true,
              location: "engine-bay",
            },
          ]
        : i % 3 === 1
          ? [{ kind: "torque", fastener: "Bracket bolt", value: 25, unit: "N·m", valueSource: "accessory-maker" }]
          : [{ kind: "caution", signalWord: "CAUTION", text: "Disconnect the negative battery terminal first." }],
  }));
  return {
    version,
    title: "Forty-step harness install (bench)",
    summary: "A long guide for the autosave benchmark.",
    category: "lighting" as const,
    difficulty: 3,
    minutes: 240,
    steps,
    fitment: [{ variantId, status: "fits" as const, note: null }],
    parts: [{ name: "Harness", quantity: 1, partNumber: null, notes: null, stepIndex: 0 }],
    tools: [{ name: "Trim tool" }],
  };
}

export async function runAuthoring(databaseFile: string, runs: number, options: { photos: boolean }) {
  process.env.DATABASE_URL = `file:${databaseFile}`;
  const { getDb } = await import("~/db/client.server");
  const { createGuide, saveDraft } = await import("~/models/guides.server");
  const { draftInputSchema } = await import("~/models/guide-input");
  const { users, variants } = await import("~/db/schema");
  const { eq } = await import("drizzle-orm");
  const db = await getDb();
  const [author] = await db.select().from(users).where(eq(users.email, "author@torqueleaf.test"));
  const [variant] = await db.select({ id: variants.id }).from(variants).limit(1);
  const created = await createGuide(db, author, {
    title: "Forty-step harness install (bench)",
    summary: "",
    category: "lighting",
    difficulty: 3,
    minutes: 240,
  });
  let version = created.draft.version;
  const save = async (edit: number) => {
    // What the route does per save: parse the body, then save.
    const input = draftInputSchema.parse(longDraft(version, variant.id, edit));
    version = (await saveDraft(db, created.id, author, input)).version;
  };
  const same = summarize(await timeRuns(runs, () => save(0)));
  let edit = 0;
  const typing = summarize(await timeRuns(runs, () => save(++edit)));
  console.log(`\nAutosave of a 40-step guide, in-process (parse + save, ${runs} saves each; goal: median ≤ 50 ms)\n`);
  const row = (label: string, { p50, p99, mean }: typeof same) => [label, formatMs(p50), formatMs(p99), formatMs(mean)];
  console.log(
    formatTable(
      ["case", "p50 ms", "p99 ms", "mean ms"],
      [row("PUT draft: 40 steps, 40 callouts, unchanged", same), row("PUT draft: the same, one step's text edited", typing)],
    ),
  );
  if (!options.photos) return;
  for (const line of await photoBench()) console.log(line);
}

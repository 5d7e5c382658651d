/**
 * `npm run bench`: the read path measured side by side in one run, against the bare React Router
 * app of bench/bare. No assertions: read the ratios (and, at scale, the goals beside each figure).
 *
 *   npm run bench                    bare page, Library, a guide page and the API, twice; 200 readers;
 *                                    a reader's checklist tick round trip
 *   npm run bench -- --quick         the same in under 2 minutes (shorter runs, 15 s of readers)
 *   npm run bench -- --scale PATH    Library filters and search at scale (a `npm run bench:data` database)
 *   npm run bench -- --models        the model functions in-process on the demo database
 *   npm run bench -- --authoring     autosave of a 40-step guide and the photo pipeline, in-process
 *                                    (`--no-photos`: the autosave alone)
 *   --rebuild                        build both apps even when their builds look up to date
 */
import { rmSync } from "node:fs";
import { availableParallelism, loadavg } from "node:os";
import { dirname, join } from "node:path";
import { baseDataKey } from "../tests/support/services";
import type { CannonResult } from "./load";
import { runAuthoring } from "./authoring";
import { bundleFigures } from "./bundles";
import { checklistTicks } from "./checklist";
import { runModels } from "./models";
import { runScale } from "./scale";
import { steadiness } from "./steadiness";
import {
  BARE_DIR,
  buildIfStale,
  demoCopy,
  memory,
  PINNING,
  ROOT,
  resetPeak,
  runLoad,
  type Server,
  sampleRss,
  startBare,
  startTorqueleaf,
  TORQUELEAF_BUNDLES,
} from "./servers";
import { formatMiB, formatMs, formatRatio, formatTable, option, ratio } from "./stats";

/** The ports of this benchmark: Torqueleaf under test, and the bare app. */
const TORQUELEAF_PORT = Number(process.env.BENCH_PORT ?? 3740);
const BARE_PORT = Number(process.env.BENCH_BARE_PORT ?? 3750);
const GUIDE_SLUG = "kestrel-hood-auxiliary-lamps";

const args = process.argv.slice(2);
const quick = args.includes("--quick");
const rebuild = args.includes("--rebuild");
const scalePath = option(args, "scale");

const plan = quick
  ? {
      warmupSeconds: 1,
      seconds: 3,
      readerSeconds: 15,
      modelRuns: 50,
      scaleRuns: 30,
      scaleBudgetMs: 5_000,
      scaleCaseLimitMs: 60_000,
      scaleHttpSeconds: 3,
      tickRuns: 100,
    }
  : {
      warmupSeconds: 3,
      seconds: 10,
      readerSeconds: 60,
      modelRuns: 300,
      scaleRuns: 100,
      scaleBudgetMs: 20_000,
      scaleCaseLimitMs: 300_000,
      scaleHttpSeconds: 10,
      tickRuns: 500,
    };

const started = Date.now();
const [load1] = loadavg();
console.log(
  `Torqueleaf read-path benchmark${quick ? " (quick)" : ""} — node ${process.version}, ${availableParallelism()} cores, ` +
    `load average ${load1.toFixed(2)}; ${PINNING ? "server on core 0, load generator on core 1 (taskset)" : "no core pinning (taskset missing or one core)"}`,
);

const appInputs = ["app", "public", "react-router.config.ts", "vite.config.ts", "package-lock.json"].map((p) => join(ROOT, p));
const bareInputs = ["app", "react-router.config.ts", "vite.config.ts"].map((p) => join(BARE_DIR, p));

const cleanups: (() => Promise<void> | void)[] = [];
async function cleanUp() {
  for (const step of cleanups.reverse()) await step();
  cleanups.length = 0;
}
for (const signal of ["SIGINT", "SIGTERM"] as const) {
  process.on(signal, () => {
    void cleanUp().then(() => process.exit(130));
  });
}

async function demoDatabase() {
  const demo = await demoCopy(baseDataKey());
  cleanups.push(() => rmSync(dirname(demo.databaseFile), { recursive: true, force: true }));
  return demo;
}

async function buildTorqueleaf() {
  const built = await buildIfStale(ROOT, appInputs, rebuild, TORQUELEAF_BUNDLES);
  console.log(built ? "built Torqueleaf (react-router build)" : "Torqueleaf's build is up to date");
}

type Target = { label: string; server: () => Server; path: string };

async function mainRun() {
  await buildTorqueleaf();
  const bareBuilt = await buildIfStale(BARE_DIR, bareInputs, rebuild);
  console.log(bareBuilt ? "built the bare app (bench/bare)" : "the bare app's build is up to date");
  const bundles = await bundleFigures(ROOT);
  console.log("\nJavaScript each page loads (gzip, from the build's manifest)\n");
  console.log(
    formatTable(
      ["page", "KiB gzip", "÷ app root"],
      bundles.map((b) => [b.label, b.kib.toFixed(1), formatRatio(b.ratio)]),
    ),
  );
  const demo = await demoDatabase();

  const bare = await startBare(BARE_PORT);
  cleanups.push(bare.stop);
  const app = await startTorqueleaf(TORQUELEAF_PORT, demo.databaseFile, demo.dataDir);
  cleanups.push(app.stop);
  console.log(`bare app at ${bare.origin} (pid ${bare.pid}), Torqueleaf at ${app.origin} (pid ${app.pid})`);

  const targets: Target[] = [
    { label: "bare page", server: () => bare, path: "/" },
    { label: "Library (/)", server: () => app, path: "/" },
    { label: "guide page", server: () => app, path: `/guides/${GUIDE_SLUG}` },
    { label: "/api/guides", server: () => app, path: "/api/guides" },
    { label: "/api/guides/:slug", server: () => app, path: `/api/guides/${GUIDE_SLUG}` },
  ];
  for (const target of targets) {
    const response = await fetch(new URL(target.path, target.server().origin));
    await response.arrayBuffer();
    if (response.status !== 200) throw new Error(`${target.label} answered ${response.status}, not 200`);
  }

  const connections = 10;
  const results: { round: number; target: Target; result: CannonResult }[] = [];
  for (const target of targets) {
    await runLoad({
      kind: "cannon",
      url: new URL(target.path, target.server().origin).href,
      connections,
      seconds: plan.warmupSeconds,
    });
  }
  for (const round of [1, 2]) {
    for (const target of targets) {
      const url = new URL(target.path, target.server().origin).href;
      results.push({ round, target, result: await runLoad({ kind: "cannon", url, connections, seconds: plan.seconds }) });
    }
  }

  const rows = results.map(({ round, target, result }) => {
    const base = results.find((r) => r.round === round && r.target === targets[0])!.result;
    return [
      target.label,
      String(round),
      result.rps.toFixed(0),
      formatMs(result.p50),
      formatMs(result.p99),
      formatRatio(ratio(result.rps, base.rps)),
      formatRatio(ratio(result.p50, base.p50)),
      formatRatio(ratio(result.p99, base.p99)),
      (result.bytesPerRequest / 1024).toFixed(1),
      String(result.errors),
    ];
  });
  console.log(
    `\nThroughput: autocannon, ${connections} connections, ${plan.seconds} s per target per round, uncompressed (no Accept-Encoding)\n`,
  );
  console.log(
    formatTable(
      ["target", "round", "req/s", "p50 ms", "p99 ms", "req/s ÷ bare", "p50 ÷ bare", "p99 ÷ bare", "KiB/answer", "errors"],
      rows,
    ),
  );

  // Readers: Library pages (with and without filters) and guide pages, in turn.
  const listing = (await (await fetch(new URL("/api/guides", app.origin))).json()) as { guides: { slug: string }[] };
  const guidePaths = listing.guides.map((g) => `/guides/${g.slug}`);
  const libraryPaths = ["/", "/?powertrain=hybrid", "/?category=lighting", "/?q=relay"];
  const paths = guidePaths.flatMap((path, i) => [libraryPaths[i % libraryPaths.length], path]);
  const peakReset = resetPeak(app.pid);
  const before = memory(app.pid);
  const sampler = sampleRss(app.pid);
  const readers = 200;
  const reading = await runLoad({
    kind: "readers",
    origin: app.origin,
    paths,
    readers,
    thinkMs: 1000,
    seconds: plan.readerSeconds,
  });
  const sampledPeak = sampler.stop();
  const after = memory(app.pid);
  console.log(
    `\n${readers} readers, each waiting 1 s after every answer, ${plan.readerSeconds} s, over ${libraryPaths.length} Library and ${guidePaths.length} guide pages (Torqueleaf)\n`,
  );
  console.log(
    formatTable(
      [
        "requests",
        "errors",
        "p50 ms",
        "p99 ms",
        "max ms",
        "RSS before",
        "peak RSS (sampled)",
        peakReset ? "peak RSS (VmHWM)" : "VmHWM since start",
      ],
      [
        [
          String(reading.requests),
          String(reading.errors),
          formatMs(reading.p50),
          formatMs(reading.p99),
          formatMs(reading.max),
          formatMiB(before.rss),
          formatMiB(sampledPeak),
          formatMiB(after.peak),
        ],
      ],
    ),
  );
  if (reading.errors) console.log(`answers: ${JSON.stringify(reading.statuses)}`);

  const ticks = await checklistTicks(app.origin, GUIDE_SLUG, plan.tickRuns);
  console.log(
    `\nChecklist tick round trip: the demo reader ticks and unticks the items of a checklist saved from ${GUIDE_SLUG}, one PATCH /api/checklists/:id/items/:itemId after the other (Torqueleaf)\n`,
  );
  console.log(
    formatTable(
      ["ticks", "p50 ms", "p99 ms", "goal p99"],
      [[String(ticks.n), formatMs(ticks.p50), formatMs(ticks.p99), "(none set)"]],
    ),
  );
}

try {
  if (args.includes("--authoring")) {
    const demo = await demoDatabase();
    await runAuthoring(demo.databaseFile, plan.modelRuns, { photos: !args.includes("--no-photos") });
  } else if (args.includes("--models")) {
    const demo = await demoDatabase();
    await runModels(demo.databaseFile, plan.modelRuns);
  } else if (scalePath) {
    await buildTorqueleaf();
    await buildIfStale(BARE_DIR, bareInputs, rebuild);
    console.log(`before: ${await steadiness()}`);
    await runScale(scalePath, {
      port: TORQUELEAF_PORT + 1,
      runs: plan.scaleRuns,
      budgetMs: plan.scaleBudgetMs,
      caseLimitMs: plan.scaleCaseLimitMs,
      httpSeconds: plan.scaleHttpSeconds,
      bare: () => startBare(BARE_PORT),
      onCleanup: (step) => cleanups.push(step),
    });
    console.log(`\nafter: ${await steadiness()}`);
  } else {
    console.log(`before: ${await steadiness()}`);
    await mainRun();
    console.log(`\nafter: ${await steadiness()}`);
  }
} finally {
  await cleanUp();
}
console.log(`\ntook ${((Date.now() - started) / 1000).toFixed(0)} s`);
process.exit(0);

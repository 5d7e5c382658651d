import sharp from "sharp";
import { MAX_INPUT_PIXELS, type PhotoStore, processImage, VARIANT_WIDTHS } from "~/services/images.server";
import { formatMiB, formatMs, formatRatio, formatTable, ratio } from "./stats";

/**
 * The photo pipeline (processImage: type check, decode, upright, three widths as WebP and JPEG)
 * against raw sharp making the same six outputs from the same 12 MP JPEG, in the same run, then
 * four uploads at once (the queue runs two). Goals (issue 11): ≤ 1.2× raw sharp's time; peak RSS
 * of four at once ≤ 600 MB. The outputs go to a store that only counts bytes, so the S3 stand-in's
 * own time is left out of both sides alike. No assertions: the figures are printed.
 */
export async function photoBench(): Promise<string[]> {
  const photo = await sharp({
    create: { width: 4000, height: 3000, channels: 3, background: "#808080", noise: { type: "gaussian", mean: 128, sigma: 40 } },
  })
    .withMetadata({ orientation: 6 })
    .jpeg({ quality: 88 })
    .toBuffer();
  let stored = 0;
  const store: PhotoStore = {
    put: async (_key, body) => {
      stored += body.byteLength;
    },
    delete: async () => undefined,
  };

  const rawSharp = async () => {
    for (const width of VARIANT_WIDTHS) {
      const resized = sharp(photo, { limitInputPixels: MAX_INPUT_PIXELS, autoOrient: true }).resize({
        width,
        withoutEnlargement: true,
      });
      stored += (await resized.clone().webp({ quality: 78 }).toBuffer()).byteLength;
      stored += (await resized.clone().jpeg({ quality: 80, mozjpeg: true }).toBuffer()).byteLength;
    }
  };
  const pipeline = async () => {
    await processImage(store, photo);
  };

  // One warm-up each, then alternate so both see the same machine load.
  await rawSharp();
  await pipeline();
  const runs = 5;
  const figures = { raw: [] as number[], ours: [] as number[], rawPeak: 0, oursPeak: 0 };
  for (let i = 0; i < runs; i++) {
    for (const [name, job] of [
      ["raw", rawSharp],
      ["ours", pipeline],
    ] as const) {
      const { ms, peak } = await measured(job);
      figures[name].push(ms);
      const key = name === "raw" ? "rawPeak" : "oursPeak";
      figures[key] = Math.max(figures[key], peak);
    }
  }
  const median = (xs: number[]) => [...xs].sort((a, b) => a - b)[Math.floor(xs.length / 2)];
  const four = await measured(() => Promise.all([pipeline(), pipeline(), pipeline(), pipeline()]).then(() => undefined));

  const rawMs = median(figures.raw);
  const oursMs = median(figures.ours);
  return [
    `Photo pipeline: a ${(photo.byteLength / 1024 / 1024).toFixed(1)} MB 12 MP JPEG (4000 × 3000, EXIF orientation 6) → 480/960/1600 as WebP and JPEG, median of ${runs}`,
    "",
    formatTable(
      ["case", "median ms", "peak RSS", "ratio to raw sharp"],
      [
        ["raw sharp, same six outputs", formatMs(rawMs), formatMiB(figures.rawPeak), "1.00×"],
        ["processImage (goal ≤ 1.2×)", formatMs(oursMs), formatMiB(figures.oursPeak), formatRatio(ratio(oursMs, rawMs))],
        ["4 uploads at once, 2 run (goal ≤ 600 MB)", formatMs(four.ms), formatMiB(four.peak), "–"],
      ],
    ),
    `(${formatMiB(stored)} of variants written in all)`,
  ];
}

/** Time and peak resident memory (sampled every 5 ms) of one job. */
async function measured(job: () => Promise<void>): Promise<{ ms: number; peak: number }> {
  let peak = process.memoryUsage.rss();
  const sampler = setInterval(() => {
    peak = Math.max(peak, process.memoryUsage.rss());
  }, 5);
  const started = performance.now();
  try {
    await job();
  } finally {
    clearInterval(sampler);
  }
  const ms = performance.now() - started;
  return { ms, peak: Math.max(peak, process.memoryUsage.rss()) };
}

import { createHash } from "node:crypto";
import { mkdirSync, readdirSync, readFileSync } from "node:fs";
import { join } from "node:path";
import { build } from "esbuild";
import sharp from "sharp";

/**
 * The offline part of `npm run build`, after React Router's: bundles the service worker into
 * build/client/sw.js (served from the site root, so its scope is the whole app) and draws the
 * installable app's PNG icons from public/app-icon.svg. The worker carries the build's id, so a
 * new deploy is a new worker file and the browser installs it.
 */
const CLIENT = "build/client";

const buildId = createHash("sha256")
  .update(readdirSync(join(CLIENT, "assets")).sort().join("\n"))
  .digest("hex")
  .slice(0, 16);

await build({
  entryPoints: ["app/service-worker/worker.ts"],
  outfile: join(CLIENT, "sw.js"),
  bundle: true,
  format: "iife",
  platform: "browser",
  target: "es2022",
  minify: true,
  define: { __TL_BUILD__: JSON.stringify(buildId) },
  logLevel: "warning",
});

// The sizes a phone asks for when it installs the app (192 and 512 px, the Web App Manifest's usual pair).
mkdirSync(join(CLIENT, "icons"), { recursive: true });
const svg = readFileSync("public/app-icon.svg");
for (const size of [192, 512]) {
  await sharp(svg, { density: 72 * (size / 512) * 4 })
    .resize(size, size)
    .png()
    .toFile(join(CLIENT, "icons", `icon-${size}.png`));
}

import { readFileSync } from "node:fs";
import { join } from "node:path";
import { pathToFileURL } from "node:url";
import { gzipSync } from "node:zlib";

type RouteAssets = { id: string; parentId?: string; module: string; imports?: string[] };
type Manifest = { entry: { module: string; imports: string[] }; routes: Record<string, RouteAssets> };

/** The JavaScript a browser loads to show one route (and its parents): the entry, then each route module with its imports. */
function routeFiles(manifest: Manifest, routeId: string): Set<string> {
  const files = new Set([manifest.entry.module, ...manifest.entry.imports]);
  const chain: RouteAssets[] = [];
  for (let id: string | undefined = routeId; id; id = manifest.routes[id]?.parentId) {
    const route = manifest.routes[id];
    if (!route) throw new Error(`no route ${id} in the build's manifest`);
    chain.push(route);
  }
  for (const route of chain) for (const file of [route.module, ...(route.imports ?? [])]) files.add(file);
  return files;
}

function gzipBytes(clientDir: string, files: Set<string>): number {
  let total = 0;
  for (const file of files) total += gzipSync(readFileSync(join(clientDir, file.replace(/^\//, "")))).byteLength;
  return total;
}

/**
 * The gzip size of the JavaScript each page loads, from the built app's own manifest: the reader
 * pages against the app's bare root (entry and root route only), and the guide editor's.
 */
export async function bundleFigures(root: string): Promise<{ label: string; kib: number; ratio: number }[]> {
  const build = (await import(pathToFileURL(join(root, "build/server/index.js")).href)) as { assets: Manifest };
  const clientDir = join(root, "build/client");
  const bare = gzipBytes(clientDir, routeFiles(build.assets, "root"));
  const pages = [
    ["app root (entry + root)", "root"],
    ["Library", "routes/library"],
    ["guide page", "routes/guide"],
    ["Workbench", "routes/workbench"],
    ["guide editor", "routes/workbench.guide"],
  ] as const;
  return pages.map(([label, id]) => {
    const bytes = gzipBytes(clientDir, routeFiles(build.assets, id));
    return { label, kib: bytes / 1024, ratio: bytes / bare };
  });
}

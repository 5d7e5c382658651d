import { existsSync, readdirSync, readFileSync, statSync } from "node:fs";
import { dirname, join, relative, resolve } from "node:path";
import { fileURLToPath } from "node:url";

/** The repository's root folder. */
export const ROOT = resolve(dirname(fileURLToPath(import.meta.url)), "../..");

// `import … from "x"`, `import "x"`, `export … from "x"` (types included) and `import("x")`.
const SPECIFIER =
  /(?:^|[\s;}])(?:import|export)\s+(?:type\s+)?(?:[^'"`;]*?\bfrom\s*)?["']([^"'\n]+)["']|\bimport\(\s*["']([^"'\n]+)["']\s*\)/g;
const SOURCE = /\.(?:ts|tsx|js|mjs)$/;

/** Every import specifier written in a TypeScript or JavaScript source. */
export function importSpecifiers(source: string): string[] {
  const withoutComments = source.replace(/\/\*[\s\S]*?\*\//g, "").replace(/^\s*\/\/.*$/gm, "");
  return [...withoutComments.matchAll(SPECIFIER)].map((m) => m[1] ?? m[2]);
}

/** The project file a `~/` or relative specifier names, or null for a package or a generated module. */
export function resolveImport(fromFile: string, specifier: string): string | null {
  let base: string;
  if (specifier.startsWith("~/")) base = join(ROOT, "app", specifier.slice(2));
  else if (specifier.startsWith(".")) base = resolve(dirname(fromFile), specifier);
  else return null;
  const stem = base.replace(/\.js$/, "");
  for (const candidate of [base, `${stem}.ts`, `${stem}.tsx`, join(base, "index.ts"), join(base, "index.tsx")]) {
    if (existsSync(candidate) && statSync(candidate).isFile()) return candidate;
  }
  return null;
}

/** The project files a source file imports directly. */
export function localImports(file: string): string[] {
  const found = new Set<string>();
  for (const specifier of importSpecifiers(readFileSync(file, "utf8"))) {
    const target = resolveImport(file, specifier);
    if (target) found.add(target);
  }
  return [...found];
}

/** Every file under `folder` whose name matches `pattern`, sorted. */
export function filesUnder(folder: string, pattern: RegExp = SOURCE): string[] {
  const out: string[] = [];
  for (const entry of readdirSync(folder, { withFileTypes: true })) {
    const path = join(folder, entry.name);
    if (entry.isDirectory()) out.push(...filesUnder(path, pattern));
    else if (pattern.test(entry.name)) out.push(path);
  }
  return out.sort();
}

/** The given files and everything they import, directly or not, inside the project. */
export function importClosure(roots: string[]): string[] {
  const seen = new Set<string>();
  const stack = roots.map((r) => resolve(ROOT, r));
  while (stack.length) {
    const file = stack.pop()!;
    if (seen.has(file)) continue;
    seen.add(file);
    if (SOURCE.test(file)) stack.push(...localImports(file));
  }
  return [...seen].sort();
}

/**
 * The import cycles among `files` (Tarjan's strongly connected components): each one as a path
 * relative to the root that starts and ends on the same file.
 */
export function importCycles(files: string[]): string[][] {
  const inside = new Set(files);
  const edges = new Map(files.map((f) => [f, localImports(f).filter((t) => inside.has(t))]));
  const index = new Map<string, number>();
  const low = new Map<string, number>();
  const stack: string[] = [];
  const onStack = new Set<string>();
  const components: string[][] = [];
  let next = 0;
  const visit = (file: string) => {
    index.set(file, next);
    low.set(file, next++);
    stack.push(file);
    onStack.add(file);
    for (const target of edges.get(file) ?? []) {
      if (!index.has(target)) {
        visit(target);
        low.set(file, Math.min(low.get(file)!, low.get(target)!));
      } else if (onStack.has(target)) {
        low.set(file, Math.min(low.get(file)!, index.get(target)!));
      }
    }
    if (low.get(file) === index.get(file)) {
      const component: string[] = [];
      let member: string;
      do {
        member = stack.pop()!;
        onStack.delete(member);
        component.push(member);
      } while (member !== file);
      if (component.length > 1 || edges.get(file)?.includes(file)) components.push(component);
    }
  };
  for (const file of files) if (!index.has(file)) visit(file);
  // One concrete loop per component, for a readable message.
  return components.map((component) => {
    const members = new Set(component);
    const start = [...component].sort()[0];
    const path = [start];
    const seen = new Set([start]);
    for (let at = start; ; ) {
      const step = (edges.get(at) ?? []).filter((t) => members.has(t));
      const back = step.find((t) => t === start);
      if (back && path.length > 1) break;
      const onward = step.find((t) => !seen.has(t)) ?? step[0];
      path.push(onward);
      if (onward === start || seen.has(onward)) break;
      seen.add(onward);
      at = onward;
    }
    if (path.at(-1) !== start) path.push(start);
    return path.map((f) => relative(ROOT, f));
  });
}

import { readFileSync } from "node:fs";
import { fileURLToPath } from "node:url";
import { z } from "zod";

/**
 * Offline dependency check: compares every package in package-lock.json with the floors and bans
 * kept in app/security/dependency-floors.json. It stands in for `npm audit` where the advisory service
 * cannot be reached; the list is maintained by hand from published advisories.
 */

const versionText = z.string().regex(/^\d+\.\d+\.\d+(-[0-9A-Za-z.-]+)?(\+[0-9A-Za-z.-]+)?$/, "a semantic version");

export const floorsSchema = z.object({
  about: z.string().optional(),
  floors: z.array(z.object({ packages: z.array(z.string().min(1)).min(1), min: versionText })),
  banned: z.array(z.object({ package: z.string().min(1), below: versionText.optional(), reason: z.string().min(1) })),
});
export type Floors = z.infer<typeof floorsSchema>;

export type LockFile = { packages?: Record<string, { version?: string; link?: boolean }> };

export type Violation = { path: string; name: string; version: string; problem: string };

type Parsed = { core: [number, number, number]; pre: string[] };

function parse(version: string): Parsed {
  const match = /^v?(\d+)\.(\d+)\.(\d+)(?:-([0-9A-Za-z.-]+))?(?:\+[0-9A-Za-z.-]+)?$/.exec(version.trim());
  if (!match) throw new Error(`Not a semantic version: "${version}"`);
  return { core: [Number(match[1]), Number(match[2]), Number(match[3])], pre: match[4] ? match[4].split(".") : [] };
}

/**
 * Semantic Versioning 2.0.0 precedence (https://semver.org/#spec-item-11): major, minor and patch
 * numerically; a pre-release sorts before its release; pre-release identifiers compare one by one,
 * numeric ones numerically and below alphanumeric ones, which compare in ASCII order; a longer set
 * wins when all before are equal. Build metadata is ignored. Returns -1, 0 or 1.
 */
export function compareVersions(a: string, b: string): -1 | 0 | 1 {
  const x = parse(a);
  const y = parse(b);
  for (let i = 0; i < 3; i++) if (x.core[i] !== y.core[i]) return x.core[i] < y.core[i] ? -1 : 1;
  if (!x.pre.length || !y.pre.length) return x.pre.length === y.pre.length ? 0 : x.pre.length ? -1 : 1;
  for (let i = 0; i < Math.max(x.pre.length, y.pre.length); i++) {
    const p = x.pre[i];
    const q = y.pre[i];
    if (p === undefined) return -1;
    if (q === undefined) return 1;
    if (p === q) continue;
    const pn = /^\d+$/.test(p);
    const qn = /^\d+$/.test(q);
    if (pn && qn) return Number(p) < Number(q) ? -1 : 1;
    if (pn !== qn) return pn ? -1 : 1;
    return p < q ? -1 : 1;
  }
  return 0;
}

/** The package name of a lock-file key: the part after the last `node_modules/`. */
export function packageName(path: string) {
  const at = path.lastIndexOf("node_modules/");
  return at === -1 ? null : path.slice(at + "node_modules/".length);
}

function matches(pattern: string, name: string) {
  return pattern.endsWith("/*") ? name.startsWith(pattern.slice(0, -1)) : pattern === name;
}

/** Every package under `packages` that is below its floor or banned, in lock-file order. */
export function checkLockFile(lock: LockFile, floors: Floors): Violation[] {
  const violations: Violation[] = [];
  for (const [path, entry] of Object.entries(lock.packages ?? {})) {
    const name = packageName(path);
    if (!name || entry.link) continue;
    const version = entry.version;
    if (!version) {
      violations.push({ path, name, version: "(none)", problem: "the lock file gives no version" });
      continue;
    }
    for (const floor of floors.floors) {
      if (floor.packages.some((p) => matches(p, name)) && compareVersions(version, floor.min) < 0) {
        violations.push({ path, name, version, problem: `below the floor ${floor.min}` });
      }
    }
    for (const ban of floors.banned) {
      if (ban.package !== name) continue;
      if (!ban.below) violations.push({ path, name, version, problem: `banned in every version: ${ban.reason}` });
      else if (compareVersions(version, ban.below) < 0) {
        violations.push({ path, name, version, problem: `banned below ${ban.below}: ${ban.reason}` });
      }
    }
  }
  return violations;
}

const fromRoot = (path: string) => fileURLToPath(new URL(`../../${path}`, import.meta.url));

export function readFloors(file = fromRoot("app/security/dependency-floors.json")): Floors {
  return floorsSchema.parse(JSON.parse(readFileSync(file, "utf8")));
}

export function readLockFile(file = fromRoot("package-lock.json")): LockFile {
  return JSON.parse(readFileSync(file, "utf8")) as LockFile;
}

export const describeViolation = (v: Violation) => `${v.name}@${v.version} (${v.path}): ${v.problem}`;

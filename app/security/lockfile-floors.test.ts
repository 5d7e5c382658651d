import { describe, expect, it } from "vitest";
import { checkLockFile, compareVersions, type Floors, floorsSchema, type LockFile, readFloors } from "./lockfile-floors";

const FLOORS: Floors = {
  floors: [
    { packages: ["react-router", "@react-router/*"], min: "7.18.3" },
    { packages: ["@tiptap/*"], min: "3.30.5" },
  ],
  banned: [
    { package: "dicer", reason: "test ban" },
    { package: "busboy", below: "1.0.0", reason: "test ban below 1.0.0" },
  ],
};

const lock = (packages: Record<string, string>): LockFile => ({
  packages: { "": {}, ...Object.fromEntries(Object.entries(packages).map(([path, version]) => [path, { version }])) },
});
const found = (l: LockFile) => checkLockFile(l, FLOORS).map((v) => `${v.path}@${v.version}`);

describe("compareVersions", () => {
  it("orders the Semantic Versioning 2.0.0 precedence example (semver.org, item 11)", () => {
    // The spec's own chain: 1.0.0-alpha < 1.0.0-alpha.1 < 1.0.0-alpha.beta < 1.0.0-beta < 1.0.0-beta.2
    // < 1.0.0-beta.11 < 1.0.0-rc.1 < 1.0.0, and 1.0.0 < 2.0.0 < 2.1.0 < 2.1.1.
    const chain = ["1.0.0-alpha", "1.0.0-alpha.1", "1.0.0-alpha.beta", "1.0.0-beta", "1.0.0-beta.2", "1.0.0-beta.11"];
    chain.push("1.0.0-rc.1", "1.0.0", "2.0.0", "2.1.0", "2.1.1");
    for (let i = 0; i < chain.length; i++) {
      for (let j = 0; j < chain.length; j++) {
        expect(compareVersions(chain[i], chain[j]), `${chain[i]} vs ${chain[j]}`).toBe(Math.sign(i - j));
      }
    }
  });

  it("compares numerically, not as text, and ignores build metadata (semver.org, items 2 and 10)", () => {
    expect(compareVersions("0.35.10", "0.35.4")).toBe(1);
    expect(compareVersions("10.0.0", "9.1.1")).toBe(1);
    expect(compareVersions("1.0.0+build.7", "1.0.0+build.1")).toBe(0);
  });

  it("refuses text that is not a version", () => {
    expect(() => compareVersions("latest", "1.0.0")).toThrow(/Not a semantic version/);
  });
});

describe("checkLockFile", () => {
  it("reports a banned package in any version, at the top level or nested", () => {
    expect(found(lock({ "node_modules/dicer": "0.3.0" }))).toEqual(["node_modules/dicer@0.3.0"]);
    expect(found(lock({ "node_modules/a/node_modules/dicer": "9.9.9" }))).toEqual(["node_modules/a/node_modules/dicer@9.9.9"]);
  });

  it("reports a package banned below a version, and only below it", () => {
    expect(found(lock({ "node_modules/busboy": "0.3.1" }))).toEqual(["node_modules/busboy@0.3.1"]);
    expect(found(lock({ "node_modules/busboy": "1.0.0", "node_modules/x/node_modules/busboy": "1.6.0" }))).toEqual([]);
  });

  it("holds the floor exactly: 7.18.2 is reported, 7.18.3 and 7.18.4 are fine", () => {
    expect(found(lock({ "node_modules/react-router": "7.18.2" }))).toEqual(["node_modules/react-router@7.18.2"]);
    expect(found(lock({ "node_modules/react-router": "7.18.3" }))).toEqual([]);
    expect(found(lock({ "node_modules/react-router": "7.18.4" }))).toEqual([]);
    expect(found(lock({ "node_modules/react-router": "7.18.3-pre.1" }))).toEqual(["node_modules/react-router@7.18.3-pre.1"]);
  });

  it("applies a scope pattern to every package of the scope, nested copies included", () => {
    const l = lock({
      "node_modules/@react-router/node": "7.18.4",
      "node_modules/@react-router/dev": "7.9.0",
      "node_modules/@tiptap/pm": "3.30.5",
      "node_modules/@tiptap/react/node_modules/@tiptap/core": "3.4.0",
      "node_modules/react-router-dom": "6.0.0", // another package, not under the floor
    });
    expect(found(l)).toEqual([
      "node_modules/@react-router/dev@7.9.0",
      "node_modules/@tiptap/react/node_modules/@tiptap/core@3.4.0",
    ]);
  });

  it("reports an entry without a version rather than passing it", () => {
    const l: LockFile = { packages: { "node_modules/dicer": {} } };
    expect(checkLockFile(l, FLOORS).map((v) => v.problem)).toEqual(["the lock file gives no version"]);
  });
});

describe("app/security/dependency-floors.json", () => {
  it("is well formed and holds the agreed floors and bans", () => {
    const floors = readFloors();
    expect(floorsSchema.safeParse(floors).success).toBe(true);
    const floorOf = (name: string) => floors.floors.find((f) => f.packages.includes(name))?.min;
    expect(floorOf("react-router")).toBe("7.18.3");
    expect(floorOf("@react-router/*")).toBe("7.18.3");
    expect(floorOf("@tiptap/*")).toBe("3.30.5");
    expect(floorOf("sharp")).toBe("0.35.4");
    expect(floorOf("drizzle-orm")).toBe("0.45.2");
    expect(floorOf("nodemailer")).toBe("9.1.1");
    expect(floors.banned.map((b) => [b.package, b.below ?? "any"])).toEqual([
      ["dicer", "any"],
      ["busboy", "1.0.0"],
      ["fast-xml-parser", "4.0.0"],
    ]);
  });
});

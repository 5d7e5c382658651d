import { describe, expect, it } from "vitest";
import { checkLockFile, describeViolation, readFloors, readLockFile } from "./lockfile-floors";

// The offline stand-in for `npm audit`: the real package-lock.json against app/security/dependency-floors.json.
// Run with `npm run audit:offline`.
describe("package-lock.json", () => {
  it("holds no package below its floor and no banned package", () => {
    const violations = checkLockFile(readLockFile(), readFloors()).map(describeViolation);
    expect(violations, `\n${violations.join("\n")}\n`).toEqual([]);
  });
});

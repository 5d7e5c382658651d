import { mkdtempSync, rmSync, writeFileSync } from "node:fs";
import { tmpdir } from "node:os";
import { join } from "node:path";
import { afterAll, describe, expect, it } from "vitest";
import { filesUnder, importCycles, importSpecifiers, ROOT } from "../support/imports";

// common practice: modules that import each other load half-initialised and cannot be understood
// (or moved) one at a time; shared types and constants belong in a third module both import.
describe("import cycles", () => {
  it("there are none among the app's modules", () => {
    const cycles = importCycles(filesUnder(join(ROOT, "app")));
    expect(cycles.map((path) => path.join(" → "))).toEqual([]);
  });

  const scratch = mkdtempSync(join(tmpdir(), "torqueleaf-cycles-"));
  afterAll(() => rmSync(scratch, { recursive: true, force: true }));

  it("are found through type-only imports and re-exports, and reported as a loop", () => {
    writeFileSync(join(scratch, "a.ts"), 'import { b } from "./b";\nexport const a = b + 1;\n');
    writeFileSync(join(scratch, "b.ts"), 'export * from "./c";\nexport const b = 1;\n');
    writeFileSync(join(scratch, "c.ts"), 'import type {\n  a,\n} from "./a";\nexport type C = typeof a;\n');
    writeFileSync(join(scratch, "d.ts"), 'import { a } from "./a";\nexport const d = a;\n');
    const [cycle, ...others] = importCycles(filesUnder(scratch));
    expect(others).toEqual([]);
    expect(cycle.map((f) => f.split("/").at(-1))).toEqual(["a.ts", "b.ts", "c.ts", "a.ts"]);
  });

  it("reads every form of import but not ones in comments", () => {
    const source = [
      'import x from "./one";',
      'import "./two.css";',
      'export { y } from "~/three";',
      'const lazy = () => import("./four");',
      '// import { z } from "./commented";',
      '/* import w from "./block"; */',
    ].join("\n");
    expect(importSpecifiers(source)).toEqual(["./one", "./two.css", "~/three", "./four"]);
  });
});

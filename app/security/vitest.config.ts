import { fileURLToPath } from "node:url";
import { defineConfig } from "vitest/config";

/** `npm run audit:offline`: the floor checker's own tests, then the real lock file. No stand-ins needed. */
export default defineConfig({
  root: fileURLToPath(new URL("../..", import.meta.url)),
  test: {
    include: ["app/security/lockfile-floors.test.ts", "app/security/lockfile-floors.real.test.ts"],
  },
});

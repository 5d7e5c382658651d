import { fileURLToPath } from "node:url";
import { defineConfig } from "vitest/config";

export default defineConfig({
  resolve: { alias: { "~": fileURLToPath(new URL("./app", import.meta.url)) } },
  test: {
    // An unexpected console.error fails the test in every project.
    setupFiles: ["tests/fail-on-console-error.ts"],
    projects: [
      {
        // Pure tests beside the code (and of the code's structure): no database, no servers.
        extends: true,
        test: {
          name: "unit",
          include: ["app/**/*.test.{ts,tsx}", "tests/unit/**/*.test.ts"],
        },
      },
      {
        // Real SQLite, the local stand-ins and one shared app server, started by the global setup.
        extends: true,
        test: {
          name: "integration",
          include: ["tests/integration/**/*.test.ts"],
          globalSetup: ["tests/global-setup.ts"],
          testTimeout: 30_000,
          hookTimeout: 60_000,
        },
      },
    ],
  },
});

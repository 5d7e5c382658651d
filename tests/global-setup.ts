import { copyFileSync } from "node:fs";
import type { TestProject } from "vitest/node";
import { startAppServer } from "./support/app-server";
import { BASE_DB, SHARED_DB } from "./support/base-db";
import { startTestServices } from "./support/services";

let fakes: Awaited<ReturnType<typeof startTestServices>> | undefined;
let server: { stop: () => Promise<void> } | undefined;

/**
 * For the whole integration run: the real local stand-ins, the migrated demo database that test
 * files copy (`useTestDatabase`), and one app server on a shared copy of it (`sharedApp`).
 */
export async function setup(project: TestProject) {
  const started = Date.now();
  fakes = await startTestServices();
  copyFileSync(BASE_DB, SHARED_DB);
  // Read by the shared server's first request; test files with a database of their own set it again.
  process.env.DATABASE_URL = `file:${SHARED_DB}`;
  const app = await startAppServer({ host: "127.0.0.1" });
  server = app;
  project.provide("sharedApp", { origin: app.origin, databaseFile: SHARED_DB });
  const base = fakes.baseFromCache ? "from the cache" : "built";
  console.log(`Integration setup: base database ${base}, shared app at ${app.origin} (${Date.now() - started} ms)`);
}

export async function teardown() {
  await server?.stop();
  await fakes?.stop();
}

declare module "vitest" {
  export interface ProvidedContext {
    sharedApp: { origin: string; databaseFile: string };
  }
}

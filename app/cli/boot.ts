import { mkdirSync } from "node:fs";
import { count } from "drizzle-orm";
import { getDb, migrateDb } from "~/db/client.server";
import { guides } from "~/db/schema";
import { type LocalFakes, startLocalFakes } from "~/services/fakes";
import { getStorage } from "~/services/storage.server";
import { assertDemoAllowed, type Env, env, preferLocalDemo, standIns, updateEnv } from "~/utils/env.server";
import { loadDemoData } from "./demo-data";

const portOf = (url: string) => Number(new URL(url).port || 80);

/** Reads the settings; a refused or invalid one ends the process with its message (exit code 1). */
function settingsOrExit(localDemo: boolean): Env {
  try {
    if (localDemo) preferLocalDemo();
    return env();
  } catch (error) {
    console.error(error instanceof Error ? error.message : error);
    process.exit(1);
  }
}

/**
 * What `npm start`, `npm run dev` and the tests do before serving: start the local stand-ins
 * (LOCAL_FAKES=1) for the services whose settings name this machine, migrate the database, and
 * load the demo scenario into an empty one (DEMO_DATA=1). `localDemo` (`npm start`) turns both on
 * by default where nobody else can reach the app.
 */
export async function boot(options: { demo?: "if-empty" | "always"; localDemo?: boolean } = {}) {
  let settings = settingsOrExit(options.localDemo ?? false);
  if (options.demo === "always") {
    try {
      assertDemoAllowed(settings, "Loading the demo scenario", "Do not load it into a real deployment");
    } catch (error) {
      console.error((error as Error).message);
      process.exit(1);
    }
  }
  let fakes: LocalFakes | undefined;
  const services = standIns(settings);
  if (services.s3 || services.mail || services.github) {
    const dataDir = settings.LOCAL_FAKES_DIR;
    mkdirSync(dataDir, { recursive: true });
    fakes = await startLocalFakes({
      directory: `${dataDir}/s3`,
      bucket: settings.S3_BUCKET,
      s3Port: portOf(settings.S3_ENDPOINT),
      smtpPort: settings.SMTP_PORT,
      inboxPort: portOf(settings.MAIL_INBOX_URL),
      githubPort: portOf(settings.GITHUB_BASE_URL || "http://127.0.0.1:4600"),
      githubClientId: settings.GITHUB_CLIENT_ID,
      githubClientSecret: settings.GITHUB_CLIENT_SECRET,
      services,
    });
    // With port 0 in the settings the stand-ins pick free ports; the app must use those.
    settings = updateEnv(fakes.settings);
    const running = [
      services.s3 && `S3 ${settings.S3_ENDPOINT}`,
      services.mail && `SMTP 127.0.0.1:${settings.SMTP_PORT} (mail shown at /dev/inbox)`,
      services.github && `OAuth ${settings.GITHUB_BASE_URL}`,
    ].filter(Boolean);
    console.log(`Local stand-ins: ${running.join(", ")}`);
  }
  const db = await getDb();
  await migrateDb(db);
  const storage = getStorage();
  await storage.ensureBucket();
  if (options.demo === "always") {
    await loadDemoData(db, storage, (line) => console.log(`  ${line}`));
  } else if (settings.DEMO_DATA) {
    const [row] = await db.select({ n: count() }).from(guides);
    if ((row?.n ?? 0) === 0) {
      console.log("Loading the demo scenario…");
      await loadDemoData(db, storage, (line) => console.log(`  ${line}`));
    }
  }
  return { settings, fakes };
}

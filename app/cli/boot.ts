import { mkdirSync } from "node:fs";
import { count } from "drizzle-orm";
import { getDb, migrateDb } from "~/db/client.server";
import { guides } from "~/db/schema";
import { type LocalFakes, startLocalFakes } from "~/services/fakes";
import { getStorage } from "~/services/storage.server";
import { env, updateEnv } from "~/utils/env.server";
import { loadDemoData } from "./demo-data";

const portOf = (url: string) => Number(new URL(url).port || 80);

/**
 * What `npm start`, `npm run dev` and the tests do before serving: start the local stand-ins
 * (LOCAL_FAKES=1), migrate the database, and load the demo scenario into an empty one (DEMO_DATA=1).
 */
export async function boot(options: { demo?: "if-empty" | "always" } = {}) {
  let settings = env();
  let fakes: LocalFakes | undefined;
  if (settings.LOCAL_FAKES) {
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
    });
    // With port 0 in the settings the stand-ins pick free ports; the app must use those.
    settings = updateEnv(fakes.settings);
    console.log(
      `Local stand-ins: S3 ${fakes.settings.S3_ENDPOINT}, SMTP 127.0.0.1:${fakes.settings.SMTP_PORT}, OAuth ${fakes.settings.GITHUB_BASE_URL}`,
    );
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

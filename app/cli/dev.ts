import { createServer } from "vite";
import { peerAddressPlugin } from "~/services/auth/client-address.server";
import { bodyLimitPlugin } from "~/services/http/body-limit.server";
import { httpHardeningPlugin } from "~/services/http/security-headers.server";
import { boot } from "./boot";

/** Development server: boot (fakes, migrations, demo data), then Vite with React Router's plugin. */
const { settings } = await boot();
const vite = await createServer({
  // HOST empty: every interface.
  server: { port: settings.PORT, host: settings.HOST || true, strictPort: true },
  plugins: [bodyLimitPlugin(), peerAddressPlugin(), httpHardeningPlugin()],
});
await vite.listen();
vite.printUrls();
// The outbox worker, loaded through Vite like the routes, so it shares their settings and database.
const { startOutboxWorker } = (await vite.ssrLoadModule(
  "/app/services/mail/outbox-worker.server.ts",
)) as typeof import("~/services/mail/outbox-worker.server");
startOutboxWorker();

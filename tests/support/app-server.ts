import { createServer as createNetServer } from "node:net";
import type { ViteDevServer } from "vite";
import { peerAddressPlugin } from "~/services/auth/client-address.server";
import { bodyLimitPlugin } from "~/services/http/body-limit.server";
import { httpHardeningPlugin } from "~/services/http/security-headers.server";

async function freePort(): Promise<number> {
  return new Promise((resolve, reject) => {
    const server = createNetServer();
    server.once("error", reject);
    server.listen(0, "127.0.0.1", () => {
      const { port } = server.address() as { port: number };
      server.close(() => resolve(port));
    });
  });
}

/**
 * Serves the app from source exactly as `npm run dev` does (Vite with React Router's plugin and
 * our peer-address stamp, and the outbox worker), on a free port, against the calling file's database copy. Tests talk
 * to it over real HTTP, so the root middleware, cookies and redirects are all in play.
 *
 * `host` is where it listens and what the origin names: the shared server of the integration run
 * listens on 127.0.0.1, so that clients can connect from other loopback addresses.
 */
export async function startAppServer(
  options: { host?: "localhost" | "127.0.0.1" } = {},
): Promise<{ origin: string; stop: () => Promise<void> }> {
  const host = options.host ?? "localhost";
  const port = await freePort();
  const origin = `http://${host}:${port}`;
  process.env.APP_ORIGIN = origin;
  process.env.PORT = String(port);
  const { createServer } = await import("vite");
  const vite: ViteDevServer = await createServer({
    logLevel: "error",
    server: { port, strictPort: true, host, hmr: false, watch: null },
    plugins: [bodyLimitPlugin(), peerAddressPlugin(), httpHardeningPlugin()],
  });
  await vite.listen();
  // As `npm run dev` does: the outbox worker, loaded through Vite like the routes, so it reads the
  // same settings and database as the app it serves.
  const { startOutboxWorker } = (await vite.ssrLoadModule(
    "/app/services/mail/outbox-worker.server.ts",
  )) as typeof import("~/services/mail/outbox-worker.server");
  const outbox = startOutboxWorker();
  return {
    origin,
    stop: async () => {
      await outbox.stop();
      await vite.close();
    },
  };
}

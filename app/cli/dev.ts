import { createServer } from "vite";
import { peerAddressPlugin } from "~/services/auth/client-address.server";
import { boot } from "./boot";

/** Development server: boot (fakes, migrations, demo data), then Vite with React Router's plugin. */
const { settings } = await boot();
const vite = await createServer({ server: { port: settings.PORT, strictPort: true }, plugins: [peerAddressPlugin()] });
await vite.listen();
vite.printUrls();

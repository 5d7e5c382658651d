import { createServer } from "vite";
import { peerAddressPlugin } from "~/services/auth/client-address.server";
import { httpHardeningPlugin } from "~/services/http/security-headers.server";
import { boot } from "./boot";

/** Development server: boot (fakes, migrations, demo data), then Vite with React Router's plugin. */
const { settings } = await boot();
const vite = await createServer({
  server: { port: settings.PORT, strictPort: true },
  plugins: [peerAddressPlugin(), httpHardeningPlugin()],
});
await vite.listen();
vite.printUrls();

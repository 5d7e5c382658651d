import { createServer } from "vite";
import { boot } from "./boot";

/** Development server: boot (fakes, migrations, demo data), then Vite with React Router's plugin. */
const { settings } = await boot();
const vite = await createServer({ server: { port: settings.PORT, strictPort: true } });
await vite.listen();
vite.printUrls();

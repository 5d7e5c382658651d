import { boot } from "./boot";

/** `npm run db:seed`: loads the demo scenario (idempotent) through the app's own model functions. */
const { fakes } = await boot({ demo: "always" });
await fakes?.stop();
console.log("Demo data loaded.");

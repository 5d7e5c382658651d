import { type FakeOptions, startFakeServers } from "./servers";

/**
 * Entry of the stand-ins' own process (see index.ts): a fault in one of them ends this process,
 * never the app's. Receives its options over IPC and answers with the stand-ins' settings.
 */
process.once("message", async (options: FakeOptions) => {
  try {
    const servers = await startFakeServers(options);
    process.send?.({ ready: servers.settings });
    const stop = () => void servers.stop().finally(() => process.exit(0));
    process.once("SIGTERM", stop);
    process.once("SIGINT", stop);
  } catch (error) {
    process.send?.({ failed: error instanceof Error ? error.message : String(error) }, () => process.exit(1));
  }
});
// The app went away (even by a crash): nothing left to serve.
process.once("disconnect", () => process.exit(0));

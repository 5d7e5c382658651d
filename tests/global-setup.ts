import type { LocalFakes } from "~/services/fakes";
import { startTestServices } from "./support/services";

let fakes: LocalFakes | undefined;

/** Real local stand-ins for the whole run, and the migrated demo database every test file copies. */
export async function setup() {
  fakes = await startTestServices();
}

export async function teardown() {
  await fakes?.stop();
}

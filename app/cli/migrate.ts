import { getDb, migrateDb } from "~/db/client.server";

await migrateDb(await getDb());
console.log("Migrations applied.");

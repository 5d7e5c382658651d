import { defineConfig } from "drizzle-kit";

export default defineConfig({
  dialect: "turso",
  schema: "./app/db/schema.ts",
  out: "./drizzle",
  casing: "snake_case",
  dbCredentials: { url: process.env.DATABASE_URL ?? "file:./data/torqueleaf.db" },
  // The full-text index is a virtual table with triggers that drizzle-kit does not model.
  tablesFilter: ["!guide_search*"],
});

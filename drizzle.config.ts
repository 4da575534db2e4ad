import { defineConfig } from "drizzle-kit";

export default defineConfig({
  dialect: "postgresql",
  schema: "./db/schema/index.ts",
  out: "./db/migrations",
  // Roles are made by scripts/db.sh, not by migrations.
  entities: { roles: false },
  dbCredentials: { url: process.env.OWNER_DATABASE_URL ?? "" },
});

// Applies the committed migrations as the owner role, then sets up the job queue's schema,
// queues and grants (db/job-queue.ts). Safe to run again: applied ones are skipped.
import { drizzle } from "drizzle-orm/node-postgres";
import { migrate } from "drizzle-orm/node-postgres/migrator";
import { Pool } from "pg";
import { installJobQueue } from "@/db/job-queue";

const url = process.env.OWNER_DATABASE_URL;
if (!url) throw new Error("OWNER_DATABASE_URL is not set: run this through npm start or npm test");

const pool = new Pool({ connectionString: url, max: 1 });
try {
  await migrate(drizzle(pool), { migrationsFolder: "db/migrations" });
  await installJobQueue(url, pool);
} finally {
  await pool.end();
}

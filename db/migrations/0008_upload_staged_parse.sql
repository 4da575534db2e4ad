ALTER TABLE "uploads" ADD COLUMN "staged_parse" text;--> statement-breakpoint
-- The staged parse is gzip already (lib/data/season-logs.ts): store it without a second compression.
ALTER TABLE "uploads" ALTER COLUMN "staged_parse" SET STORAGE EXTERNAL;--> statement-breakpoint
-- A large season log is megabytes of CSV; lz4 compresses it many times faster than the default (pglz).
ALTER TABLE "uploads" ALTER COLUMN "content" SET COMPRESSION lz4;

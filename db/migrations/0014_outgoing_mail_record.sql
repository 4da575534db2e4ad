CREATE TYPE "public"."mail_outcome" AS ENUM('queued', 'sent', 'retrying', 'failed', 'cancelled');--> statement-breakpoint
CREATE TABLE "outgoing_mail" (
	"id" uuid PRIMARY KEY NOT NULL,
	"kind" text NOT NULL,
	"recipient" text NOT NULL,
	"subject" text NOT NULL,
	"queued_at" timestamp with time zone DEFAULT now() NOT NULL,
	"outcome" "mail_outcome" DEFAULT 'queued' NOT NULL,
	"attempts" integer DEFAULT 0 NOT NULL,
	"last_attempt_at" timestamp with time zone,
	"problem" text
);
--> statement-breakpoint
ALTER TABLE "mail_messages" DISABLE ROW LEVEL SECURITY;--> statement-breakpoint
DROP TABLE "mail_messages" CASCADE;--> statement-breakpoint
ALTER TABLE "access_tokens" ALTER COLUMN "token_hash" DROP NOT NULL;--> statement-breakpoint
CREATE INDEX "outgoing_mail_queued_idx" ON "outgoing_mail" USING btree ("queued_at");
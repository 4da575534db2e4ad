CREATE TYPE "public"."date_style" AS ENUM('iso', 'day-month-year', 'month-day-year', 'day-month-year-dots');--> statement-breakpoint
ALTER TABLE "users" ADD COLUMN "time_zone" text;--> statement-breakpoint
ALTER TABLE "users" ADD COLUMN "date_style" date_style DEFAULT 'iso' NOT NULL;
import { env } from "@/lib/env";

/** The app's public address, for links in e-mails (APP_URL; without it, npm start's address). */
export function appUrl(): string {
  return env("APP_URL");
}

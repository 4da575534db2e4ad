/** The app's public address, for links in e-mails (APP_URL; without it, npm start's address). */
export function appUrl(): string {
  return (process.env.APP_URL ?? "http://127.0.0.1:3000").replace(/\/+$/, "");
}

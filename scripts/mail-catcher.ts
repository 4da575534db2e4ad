// A local stand-in for a mail service: accepts SMTP on loopback and keeps every message in
// the database, where the coordinator's "Outgoing mail" page and the tests read them.
import { simpleParser } from "mailparser";
import { Pool } from "pg";
import { SMTPServer } from "smtp-server";

const port = Number(process.env.SMTP_PORT ?? 2525);
const url = process.env.OWNER_DATABASE_URL;
if (!url) throw new Error("OWNER_DATABASE_URL is not set: start the mail catcher through npm start or npm test");
const pool = new Pool({ connectionString: url, max: 2 });
// The test run recreates its database between phases; an idle connection then ends, and the pool opens a new one.
pool.on("error", (error) => console.error(`mail catcher: database connection ended (${error.message})`));

const server = new SMTPServer({
  authOptional: true,
  disabledCommands: ["STARTTLS"],
  size: 5 * 1024 * 1024,
  onData(stream, session, callback) {
    simpleParser(stream)
      .then(async (message) => {
        const recipients = session.envelope.rcptTo.map((recipient) => recipient.address);
        await pool.query("insert into mail_messages (sender, recipients, subject, text, html) values ($1, $2, $3, $4, $5)", [
          session.envelope.mailFrom ? session.envelope.mailFrom.address : "",
          recipients,
          message.subject ?? "",
          message.text ?? "",
          typeof message.html === "string" ? message.html : "",
        ]);
        callback();
      })
      .catch((error: Error) => callback(error));
  },
});

server.listen(port, "127.0.0.1", () => console.log(`mail catcher listening on 127.0.0.1:${port}`));

for (const signal of ["SIGINT", "SIGTERM"] as const) {
  process.on(signal, () => server.close(() => void pool.end().then(() => process.exit(0))));
}

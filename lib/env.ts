import { z } from "zod";

/**
 * Every setting the app reads from its environment, checked in one place. `npm start` and
 * `npm test` set them all (scripts/lib.sh); in production set at least the database addresses,
 * AUTH_SECRET and APP_URL. Read one with `env(name)`, never `process.env`: a missing or malformed value
 * fails with a message saying what to set, not with a silent default. (Next's own NEXT_RUNTIME and
 * NEXT_PHASE are read where Next inlines them, in instrumentation.ts; NEXT_DIST_DIR is the build's.)
 */
const postgresUrl = (what: string) =>
  z
    .string({ error: `is not set: ${what} (npm start and npm test set it)` })
    .regex(/^postgres(ql)?:\/\//, { error: "must be a postgres:// address" });

const proxies = "must be a whole number from 0 to 10: the reverse proxies in front of the app (DEVELOPERS.md, Sign-in)";

const schema = z.object({
  DATABASE_URL: postgresUrl("the app role's connection"),
  ANALYST_DATABASE_URL: postgresUrl("the pooled-analysis role's connection"),
  JOBS_DATABASE_URL: postgresUrl("the job workers' connection"),
  AUTH_SECRET: z
    .string({ error: "is not set: the secret that signs sessions and unsubscribe links (openssl rand -base64 32)" })
    .min(32, { error: "is too short: use at least 32 characters (openssl rand -base64 32)" }),
  APP_URL: z
    .url({ protocol: /^https?$/, error: "must be the app's public address, like https://coop.example" })
    .default("http://127.0.0.1:3000")
    .transform((url) => url.replace(/\/+$/, "")),
  SMTP_HOST: z.string().min(1).default("127.0.0.1"),
  SMTP_PORT: z.coerce.number({ error: "must be a port number" }).int().min(1).max(65535).default(2525),
  SMTP_SECURE: z.enum(["true", "false"], { error: 'must be "true" (TLS) or "false"' }).default("false"),
  SMTP_USER: z.string().optional(),
  SMTP_PASSWORD: z.string().optional(),
  MAIL_FROM: z.string().min(3).default("Rhizomorph <no-reply@rhizomorph.invalid>"),
  RHIZO_TRUSTED_PROXIES: z.coerce
    .number({ error: proxies })
    .int({ error: proxies })
    .min(0, { error: proxies })
    .max(10, { error: proxies })
    .default(0),
  RHIZO_JOB_WORKERS: z.enum(["on", "off"], { error: 'must be "on" or "off"' }).default("on"),
  RHIZO_JOB_POLL_SECONDS: z.coerce.number().positive({ error: "must be a number of seconds above 0" }).default(2),
});

export type Env = z.infer<typeof schema>;

/** Checks every setting at once, at start-up (instrumentation.ts): a server with a wrong one does not start. */
export function checkEnv(): Env {
  const read = schema.safeParse(withoutBlanks(process.env));
  if (read.success) return read.data;
  throw new Error(`The app's settings are not right:\n  ${read.error.issues.map(describe).join("\n  ")}`);
}

/** One setting as it is now (tests change one and put it back, so nothing is kept). */
export function env<Name extends keyof Env>(name: Name): Env[Name] {
  const value = process.env[name];
  const read = schema.shape[name].safeParse(value === "" ? undefined : value);
  if (read.success) return read.data as Env[Name];
  throw new Error(`The app's settings are not right: ${describe({ path: [name], message: read.error.issues[0].message })}`);
}

function describe(issue: { path: PropertyKey[]; message: string }): string {
  return `${issue.path.map(String).join(".")} ${issue.message}`;
}

// An empty variable means "not set", as a shell's `X= npm start` intends.
function withoutBlanks(variables: NodeJS.ProcessEnv): Record<string, string> {
  return Object.fromEntries(Object.entries(variables).filter((entry): entry is [string, string] => Boolean(entry[1])));
}

/**
 * Next calls register() once when a server process starts. In the Node runtime of a running
 * server (`next start`, `next dev`), it starts this process's job workers (lib/jobs/worker.ts);
 * not while `next build` prerenders, and not where RHIZO_JOB_WORKERS=off asks for a process
 * that only serves requests. Scripts and tests never load this file.
 */
export async function register(): Promise<void> {
  if (process.env.NEXT_RUNTIME !== "nodejs") return;
  if (process.env.NEXT_PHASE === "phase-production-build" || process.env.RHIZO_JOB_WORKERS === "off") return;
  const { startJobWorkers } = await import("./lib/jobs/worker");
  // Not awaited: a database that is down must not stop the server answering. Tried again until it starts.
  const start = () =>
    startJobWorkers().catch((error: unknown) => {
      console.error("The job workers did not start; trying again in 10 s:", error);
      setTimeout(() => void start(), 10_000).unref();
    });
  void start();
}

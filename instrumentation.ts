import { peerAddressHeader } from "@/lib/auth/client-address";

/**
 * Next calls register() once when a server process starts. In the Node runtime it does two things:
 *
 * - Next.js does not tell a route or an action which address a connection came from, and the
 *   X-Forwarded-For it passes on is whatever the client sent. So every incoming request gets the
 *   connection's own peer address in a header of ours, set over any value a client sent;
 *   lib/auth/client-address.ts trusts forwarded addresses only behind the configured number of proxies.
 * - In a running server (`next start`, `next dev`) it starts this process's job workers
 *   (lib/jobs/worker.ts); not while `next build` prerenders, and not where RHIZO_JOB_WORKERS=off
 *   asks for a process that only serves requests. Scripts and tests never load this file.
 */
export async function register(): Promise<void> {
  if (process.env.NEXT_RUNTIME !== "nodejs") return;
  if (process.env.NEXT_PHASE === "phase-production-build") return;
  // A server with a missing or wrong setting stops here, saying which one (lib/env.ts).
  const { checkEnv } = await import("./lib/env");
  const settings = checkEnv();
  await stampPeerAddresses();
  if (settings.RHIZO_JOB_WORKERS === "off") return;
  const { startJobWorkers } = await import("./lib/jobs/worker");
  // Not awaited: a database that is down must not stop the server answering. Tried again until it starts.
  const start = () =>
    startJobWorkers().catch((error: unknown) => {
      console.error("The job workers did not start; trying again in 10 s:", error);
      setTimeout(() => void start(), 10_000).unref();
    });
  void start();
}

async function stampPeerAddresses(): Promise<void> {
  const { Server } = await import("node:http");
  const prototype = Server.prototype as { emit: (event: string, ...args: unknown[]) => boolean; rhizomorphPeer?: true };
  if (prototype.rhizomorphPeer) return;
  prototype.rhizomorphPeer = true;
  const emit = prototype.emit;
  prototype.emit = function (this: unknown, event: string, ...args: unknown[]) {
    if (event === "request") {
      const request = args[0] as { headers: Record<string, string | string[] | undefined>; socket?: { remoteAddress?: string } };
      request.headers[peerAddressHeader] = request.socket?.remoteAddress ?? "";
    }
    return emit.call(this, event, ...args);
  };
}

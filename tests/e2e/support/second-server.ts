import { spawn } from "node:child_process";
import { createServer } from "node:net";

/** A port nothing listens on now, chosen by the system. */
function freePort(): Promise<number> {
  return new Promise((resolve, reject) => {
    const probe = createServer();
    probe.once("error", reject);
    probe.listen(0, "127.0.0.1", () => {
      const { port } = probe.address() as { port: number };
      probe.close(() => resolve(port));
    });
  });
}

/**
 * A second `next start` of the same build on the same database, as a second app process behind
 * a load balancer would be: its own pools, change feed and kept copies. Stop it in afterAll.
 */
export async function startSecondServer(env: Record<string, string> = {}): Promise<{ url: string; pid: number; stop: () => void }> {
  const port = await freePort();
  // Node itself, not npx: the process started is then the server (its memory can be read in /proc).
  const server = spawn(process.execPath, ["node_modules/next/dist/bin/next", "start", "--hostname", "127.0.0.1", "--port", String(port)], {
    env: { ...process.env, ...env },
    stdio: ["ignore", "ignore", "inherit"],
    detached: true,
  });
  const url = `http://127.0.0.1:${port}`;
  const stop = () => {
    try {
      process.kill(-server.pid!, "SIGTERM");
    } catch {
      // Already gone.
    }
  };
  for (let attempt = 0; ; attempt++) {
    const up = await fetch(`${url}/icon.svg`).then(
      (response) => response.ok,
      () => false,
    );
    if (up) return { url, pid: server.pid!, stop };
    if (attempt > 300) {
      stop();
      throw new Error(`The second app process did not start on ${url}`);
    }
    await new Promise((resolve) => setTimeout(resolve, 100));
  }
}

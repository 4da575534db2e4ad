import { availableParallelism } from "node:os";
import { Worker } from "node:worker_threads";
import { z } from "zod";

// Cost 12 takes a few hundred milliseconds: slow for guessing, fine for one sign-in.
export const passwordHashCost = 12;
export const minimumPasswordLength = 10;

/** A password someone chooses (joining, resetting, changing it): the one length rule, with what to do. */
export const newPasswordSchema = z
  .string()
  .min(minimumPasswordLength, `Use at least ${minimumPasswordLength} characters; a few unrelated words are easy to remember.`)
  .max(200, "Keep the password under 200 characters.");

/**
 * bcrypt is CPU work in plain JavaScript. On the main thread a burst of sign-ins would stall
 * every other request between its slices, so hashing and comparing run on worker threads, one
 * job at a time each, leaving a core for everything else; jobs wait their turn in a queue.
 */
const workerSource = `
const { parentPort } = require("node:worker_threads");
const bcrypt = require("bcryptjs");
parentPort.on("message", ({ id, kind, password, argument }) => {
  try {
    const result = kind === "hash" ? bcrypt.hashSync(password, argument) : bcrypt.compareSync(password, argument);
    parentPort.postMessage({ id, result });
  } catch (error) {
    parentPort.postMessage({ id, error: String(error) });
  }
});`;

const poolSize = Math.max(1, availableParallelism() - 1);
/** More sign-ins than this waiting for a worker: the server says it is busy rather than queue without end. */
export const maximumWaitingPasswordJobs = 100;

interface Job {
  id: number;
  kind: "hash" | "compare";
  password: string;
  argument: string | number;
  resolve: (result: string | boolean) => void;
  reject: (error: Error) => void;
}

interface PasswordWorkers {
  idle: Worker[];
  busy: Map<Worker, Job>;
  waiting: Job[];
  size: number;
  nextId: number;
}

// On globalThis, like the pools: dev reloads and test files share the workers.
const globalForWorkers = globalThis as unknown as { rhizomorphPasswordWorkers?: PasswordWorkers };

function workers(): PasswordWorkers {
  globalForWorkers.rhizomorphPasswordWorkers ??= { idle: [], busy: new Map(), waiting: [], size: 0, nextId: 0 };
  return globalForWorkers.rhizomorphPasswordWorkers;
}

function startWorker(state: PasswordWorkers): Worker {
  const worker = new Worker(workerSource, { eval: true });
  // Idle workers must not keep a script or a test run alive.
  worker.unref();
  state.size++;
  worker.on("message", (message: { id: number; result?: string | boolean; error?: string }) => {
    const job = state.busy.get(worker);
    state.busy.delete(worker);
    if (job && job.id === message.id) {
      if (message.error !== undefined) job.reject(new Error(message.error));
      else job.resolve(message.result!);
    }
    worker.unref();
    state.idle.push(worker);
    dispatch(state);
  });
  const lost = (error: Error) => {
    const job = state.busy.get(worker);
    state.busy.delete(worker);
    state.idle = state.idle.filter((entry) => entry !== worker);
    state.size--;
    job?.reject(error);
    dispatch(state);
  };
  worker.on("error", lost);
  worker.on("exit", (code) => {
    if (state.busy.has(worker) || state.idle.includes(worker)) lost(new Error(`A password worker stopped (exit code ${code})`));
  });
  return worker;
}

function dispatch(state: PasswordWorkers): void {
  while (state.waiting.length > 0) {
    const worker = state.idle.pop() ?? (state.size < poolSize ? startWorker(state) : undefined);
    if (!worker) return;
    const job = state.waiting.shift()!;
    state.busy.set(worker, job);
    // Held while it works, so a script waiting on the result does not exit under it.
    worker.ref();
    worker.postMessage({ id: job.id, kind: job.kind, password: job.password, argument: job.argument });
  }
}

function run<T extends string | boolean>(kind: Job["kind"], password: string, argument: string | number): Promise<T> {
  const state = workers();
  return new Promise<T>((resolve, reject) => {
    state.waiting.push({ id: state.nextId++, kind, password, argument, resolve: resolve as Job["resolve"], reject });
    dispatch(state);
  });
}

/** True when so many password checks wait that a new sign-in should be told to come back shortly. */
export function passwordWorkersBusy(): boolean {
  return workers().waiting.length >= maximumWaitingPasswordJobs;
}

export function hashPassword(password: string): Promise<string> {
  return run<string>("hash", password, passwordHashCost);
}

export function verifyPassword(password: string, hash: string): Promise<boolean> {
  return run<boolean>("compare", password, hash);
}

let decoyHash: Promise<string> | undefined;

/** Compared against when the e-mail is unknown, so both failures take the same time. */
export function unknownUserHash(): Promise<string> {
  decoyHash ??= hashPassword("no such member");
  return decoyHash;
}

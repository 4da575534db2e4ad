import { Client, type ClientBase, type Notification } from "pg";
import { env } from "@/lib/env";

/**
 * What PostgreSQL says has changed. The triggers of migration 0010 send a notice on commit naming
 * a topic whenever rows that this process keeps copies of are written, by this app or by anyone
 * else, and each notice starts a new generation of its topic. A copy stays good while its topic's
 * generation is unchanged.
 *
 * One connection per process does nothing but listen; while it is down notices can be missed, so
 * nothing may be kept then and every generation moves on when it is back. Every pooled connection
 * listens too: PostgreSQL sends a session its own notices just before it reports the commit done,
 * so a write made by this process is heard before the code that made it goes on (the page
 * rendered right after a server action already sees it).
 */
export const changeTopics = ["members", "pooled-statistics", "blocks-and-harvests"] as const;
export type ChangeTopic = (typeof changeTopics)[number];

const channel = "rhizomorph_changes";
/** How the listening connection shows in pg_stat_activity. */
export const listenerApplicationName = "rhizomorph change feed";
const reconnectAfterMilliseconds = 1000;

interface Feed {
  client: Client | null;
  listening: boolean;
  stopped: boolean;
  generations: Record<ChangeTopic, number>;
}

// Kept on globalThis like the pools, so dev reloads and test files share one listener.
const globalForFeed = globalThis as unknown as { rhizomorphChangeFeed?: Feed };

function feed(): Feed {
  if (!globalForFeed.rhizomorphChangeFeed) {
    const created: Feed = {
      client: null,
      listening: false,
      stopped: false,
      generations: { members: 0, "pooled-statistics": 0, "blocks-and-harvests": 0 },
    };
    globalForFeed.rhizomorphChangeFeed = created;
    void listen(created);
  }
  return globalForFeed.rhizomorphChangeFeed;
}

function bumpAll(state: Feed) {
  for (const topic of changeTopics) state.generations[topic]++;
}

async function listen(state: Feed): Promise<void> {
  if (state.stopped) return;
  const connectionString = env("DATABASE_URL");
  const client = new Client({ connectionString, application_name: listenerApplicationName });
  state.client = client;
  const lost = () => {
    if (state.client !== client) return;
    state.client = null;
    state.listening = false;
    bumpAll(state);
    client.end().catch(() => undefined);
    if (!state.stopped) setTimeout(() => void listen(state), reconnectAfterMilliseconds).unref();
  };
  client.on("error", lost);
  client.on("end", lost);
  client.on("notification", hear);
  try {
    await client.connect();
    await client.query(`LISTEN ${channel}`);
    if (state.client !== client) return;
    bumpAll(state);
    state.listening = true;
  } catch (error) {
    console.error("Listening for database changes failed; copies are not kept until it reconnects", error);
    lost();
  }
}

function hear(notice: Notification) {
  const topic = changeTopics.find((known) => known === notice.payload);
  const state = globalForFeed.rhizomorphChangeFeed;
  if (state && notice.channel === channel && topic) state.generations[topic]++;
}

/** For the pools' connections, as they open (the pools' onConnect hook). */
export async function listenForChanges(client: ClientBase): Promise<void> {
  client.on("notification", hear);
  await client.query(`LISTEN ${channel}`);
}

/** The topic's current generation, or null while changes could go unheard (then keep nothing). */
export function changeGeneration(topic: ChangeTopic): number | null {
  const state = feed();
  return state.listening ? state.generations[topic] : null;
}

/**
 * Who is asking, as a kept copy may depend on it: a request's farm context or a member. The key
 * of every copy is made from the whole caller (user, farm, role and anything else it carries),
 * so a loader cannot forget the farm and hand one farm's copy to another.
 */
export interface Caller {
  farmId: string | null;
  role: string | null;
}

function callerKey(caller: Caller): string {
  const fields = caller as unknown as Record<string, unknown>;
  return JSON.stringify(
    Object.keys(fields)
      .sort()
      .map((field) => [field, fields[field]]),
  );
}

export interface KeptLoader {
  name: string;
  topics: readonly ChangeTopic[];
  /** False for a loader kept once for everybody (keptForEveryone). */
  perCaller: boolean;
  kept: (caller: Caller, ...args: unknown[]) => Promise<unknown>;
  load: (caller: Caller, ...args: unknown[]) => Promise<unknown>;
}

/** Every kept loader by name, so a test can run each one, kept and not, as every kind of caller. */
const registry = new Map<string, KeptLoader>();

export function keptLoaders(): KeptLoader[] {
  return [...registry.values()];
}

/**
 * Keeps what `load` returns for each caller and key until one of the topics changes. The first
 * argument is always the caller, and it is always part of the key; `keyOf` covers the other
 * arguments. Concurrent callers share one load, so a change followed by many requests costs one
 * query, not one each.
 */
export function keptUntilChanged<Who extends Caller, Arguments extends unknown[], Value>(
  name: string,
  topics: ChangeTopic | readonly ChangeTopic[],
  load: (caller: Who, ...args: Arguments) => Promise<Value>,
  keyOf: (...args: Arguments) => string,
  maximumEntries = 1000,
): (caller: Who, ...args: Arguments) => Promise<Value> {
  const watched = typeof topics === "string" ? [topics] : topics;
  const entries = new Map<string, { generation: string; value: Promise<Value> }>();
  const kept = (caller: Who, ...args: Arguments): Promise<Value> => {
    // Read before loading: a change committed while the load runs must invalidate its result.
    const generations = watched.map(changeGeneration);
    if (generations.includes(null)) return load(caller, ...args);
    const generation = generations.join(":");
    const key = `${callerKey(caller)}|${keyOf(...args)}`;
    const kept = entries.get(key);
    if (kept && kept.generation === generation) return kept.value;
    const value = load(caller, ...args);
    const entry = { generation, value };
    entries.delete(key);
    if (entries.size >= maximumEntries) entries.delete(entries.keys().next().value!);
    entries.set(key, entry);
    value.catch(() => {
      if (entries.get(key) === entry) entries.delete(key);
    });
    return value;
  };
  registry.set(name, { name, topics: watched, perCaller: true, kept: kept as KeptLoader["kept"], load: load as KeptLoader["load"] });
  return kept;
}

/**
 * One copy for everybody, for what is the same whoever asks (the co-op's "results updating"
 * flag). The loader takes no arguments at all, so nothing about the caller can reach it.
 */
export function keptForEveryone<Value>(
  name: string,
  topics: ChangeTopic | readonly ChangeTopic[],
  load: () => Promise<Value>,
): () => Promise<Value> {
  const kept = keptUntilChanged(
    name,
    topics,
    () => load(),
    () => "",
    1,
  );
  const shared = () => kept(everyone);
  registry.set(name, { ...registry.get(name)!, perCaller: false, kept: shared, load: () => load() });
  return shared;
}

const everyone: Caller = { farmId: null, role: null };

export async function stopChangeFeed(): Promise<void> {
  const state = globalForFeed.rhizomorphChangeFeed;
  globalForFeed.rhizomorphChangeFeed = undefined;
  if (!state) return;
  state.stopped = true;
  state.listening = false;
  const client = state.client;
  state.client = null;
  await client?.end().catch(() => undefined);
}

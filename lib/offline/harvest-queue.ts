/**
 * The phone's queue of quick-form harvests not sent yet (IndexedDB, through idb). Each entry is the
 * form's fields with the key made for it on the phone (`clientKey`) and the member who saved it;
 * entries are only counted and sent for that member, and the server refuses one sent under
 * another's session as well. Sending again is safe: the key makes the server answer a stored entry
 * with the harvest it already has (lib/data/blocks.ts, recordHarvest).
 */
import { openDB, type DBSchema, type IDBPDatabase } from "idb";

/** The form's own fields, as the form sends them (strings). */
export interface HarvestFields {
  blockCode: string;
  flush: string;
  weight: string;
  unit: string;
  harvestedOn: string;
  /** "Room it is in now", when picked: the same field the server's schema reads (lib/season-logs/quick-harvest.ts). */
  roomId?: string;
  acceptWarnings?: string;
}

export interface QueuedHarvest {
  clientKey: string;
  memberId: string;
  /** When it was kept (ms since 1970): entries go out in the order they were picked. */
  keptAt: number;
  fields: HarvestFields;
  /** Set when the server refused the entry: it waits for the grower to correct it, and is not sent again by itself. */
  refused?: { message: string; reasons: string[] };
}

/** What the server said to one sending, as the form's action answers it (ActionState), or the failure to reach it. */
export type SendAnswer =
  | {
      status: "idle" | "ok" | "error" | "confirm";
      message?: string;
      fieldErrors?: Record<string, string[]>;
      warnings?: { message: string }[];
    }
  | { status: "unreachable" };

/**
 * Saved: take it off the phone. Refused: the entry itself is wrong (reasons on its fields, or
 * warnings to accept), so it waits for the grower. Anything else (no signal, the server down,
 * signed out, another member signed in) leaves it waiting to be sent again.
 */
export function outcomeOf(answer: SendAnswer): "sent" | "refused" | "keep" {
  if (answer.status === "ok") return "sent";
  if (answer.status === "confirm") return "refused";
  if (answer.status === "error" && answer.fieldErrors && Object.keys(answer.fieldErrors).length > 0) return "refused";
  return "keep";
}

/** The reasons of a refusal, in the words the server gave them. */
export function reasonsOf(answer: SendAnswer): string[] {
  if (answer.status === "unreachable") return [];
  return [...Object.values(answer.fieldErrors ?? {}).flat(), ...(answer.warnings ?? []).map((warning) => warning.message)];
}

interface QueueSchema extends DBSchema {
  harvests: { key: string; value: QueuedHarvest; indexes: { member: string } };
}

let opened: Promise<IDBPDatabase<QueueSchema>> | null = null;
function database(): Promise<IDBPDatabase<QueueSchema>> {
  opened ??= openDB<QueueSchema>("rhizomorph-phone", 1, {
    upgrade(db) {
      db.createObjectStore("harvests", { keyPath: "clientKey" }).createIndex("member", "memberId");
    },
  });
  return opened;
}

export async function keepHarvest(entry: QueuedHarvest): Promise<void> {
  await (await database()).put("harvests", entry);
}

/** This member's entries on this phone, oldest first. */
export async function keptFor(memberId: string): Promise<QueuedHarvest[]> {
  const entries = await (await database()).getAllFromIndex("harvests", "member", memberId);
  return entries.sort((a, b) => a.keptAt - b.keptAt);
}

export async function dropKept(clientKey: string): Promise<void> {
  await (await database()).delete("harvests", clientKey);
}

/** One sending at a time on this phone (tabs included), so entries go out in order. */
function oneAtATime<T>(work: () => Promise<T>): Promise<T> {
  if (typeof navigator !== "undefined" && "locks" in navigator)
    return navigator.locks.request("rhizomorph-harvest-queue", work).then((done) => done);
  return work();
}

/**
 * Sends this member's waiting entries in the order they were kept, stopping at the first that
 * cannot be sent now (the rest would fail the same way). Returns how many went.
 */
export function sendKept(memberId: string, send: (fields: FormData) => Promise<SendAnswer>): Promise<number> {
  return oneAtATime(async () => {
    let sent = 0;
    for (const entry of await keptFor(memberId)) {
      if (entry.refused) continue;
      const data = new FormData();
      const { acceptWarnings, ...fields } = entry.fields;
      for (const [name, value] of Object.entries(fields)) data.set(name, value);
      if (acceptWarnings) data.set("acceptWarnings", acceptWarnings);
      data.set("clientKey", entry.clientKey);
      data.set("memberId", entry.memberId);
      const answer = await send(data);
      const outcome = outcomeOf(answer);
      if (outcome === "keep") break;
      if (outcome === "sent") {
        await dropKept(entry.clientKey);
        sent++;
      } else {
        await keepHarvest({
          ...entry,
          refused: { message: answer.status === "unreachable" ? "" : (answer.message ?? ""), reasons: reasonsOf(answer) },
        });
      }
    }
    return sent;
  });
}

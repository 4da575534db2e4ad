"use client";

import { startTransition, useActionState, useCallback, useEffect, useState, useSyncExternalStore } from "react";
import { v4 as uuidv4 } from "uuid";
import { keepThisPageOffline } from "@/components/offline/service-worker";
import { Button } from "@/components/ui/button";
import { Field } from "@/components/ui/field";
import { Notice } from "@/components/ui/notice";
import type { ActionState } from "@/lib/auth/guard";
import type { HarvestTarget } from "@/lib/data/blocks";
import {
  dropKept,
  keepHarvest,
  keptFor,
  sendKept,
  type HarvestFields,
  type QueuedHarvest,
  type SendAnswer,
} from "@/lib/offline/harvest-queue";
import { roomOn } from "@/lib/rooms/regimes";
import { recordHarvestAction } from "./actions";
import { count } from "@/lib/words";

/** The server's answer, or "kept": no answer came, so the entry waits on this phone. */
type FormState = Omit<ActionState, "status"> & { status: ActionState["status"] | "kept" };
const initial: ActionState = { status: "idle" };

function fieldsOf(data: FormData): HarvestFields {
  const text = (name: string) => {
    const value = data.get(name);
    return typeof value === "string" ? value : "";
  };
  const acceptWarnings = text("acceptWarnings");
  const roomId = text("roomId");
  return {
    blockCode: text("blockCode"),
    flush: text("flush"),
    weight: text("weight"),
    unit: text("unit"),
    harvestedOn: text("harvestedOn"),
    ...(roomId ? { roomId } : {}),
    ...(acceptWarnings ? { acceptWarnings } : {}),
  };
}

/** One sending of a kept entry: the action's answer, or "unreachable" when none came (no signal, server down). */
async function sendOnce(data: FormData): Promise<SendAnswer> {
  try {
    return await recordHarvestAction(initial, data);
  } catch {
    return { status: "unreachable" };
  }
}
const units = ["g", "kg", "lb", "oz"] as const;
type Unit = (typeof units)[number];

// Where this phone keeps the unit and day last used, so a round of the grow room needs them picked once.
const rememberedKey = "rhizomorph.quick-harvest";

function today(): string {
  const now = new Date();
  return `${now.getFullYear()}-${String(now.getMonth() + 1).padStart(2, "0")}-${String(now.getDate()).padStart(2, "0")}`;
}

/** The unit always; the day only on the day it was used (tomorrow starts at tomorrow's date). */
function remembered(): { unit?: Unit; harvestedOn?: string } {
  try {
    const saved = JSON.parse(window.localStorage.getItem(rememberedKey) ?? "{}") as { unit?: string; harvestedOn?: string; on?: string };
    return {
      unit: units.find((unit) => unit === saved.unit),
      harvestedOn: saved.on === today() && typeof saved.harvestedOn === "string" ? saved.harvestedOn : undefined,
    };
  } catch {
    return {};
  }
}

const nothingToWatch = () => () => {};

function remember(unit: Unit, harvestedOn: string): void {
  try {
    window.localStorage.setItem(rememberedKey, JSON.stringify({ unit, harvestedOn, on: today() }));
  } catch {
    // A phone that keeps nothing (private browsing) just asks again.
  }
}

/** Block code with suggestions, the next flush filled in, weight as written with a unit picker, and the day picked. */
export function QuickHarvestForm({
  memberId,
  targets,
  rooms,
  initialBlock,
  defaultUnit,
}: {
  memberId: string;
  targets: HarvestTarget[];
  /** The farm's rooms in use, for "Room it is in now". */
  rooms: { id: string; name: string }[];
  initialBlock: string;
  defaultUnit: "g" | "lb";
}) {
  // This member's entries kept on the phone; null until IndexedDB has been read.
  const [kept, setKept] = useState<QueuedHarvest[] | null>(null);
  const [sentNote, setSentNote] = useState<string | null>(null);
  const reload = useCallback(() => keptFor(memberId).then(setKept, () => setKept([])), [memberId]);
  const sendWaiting = useCallback(async () => {
    try {
      const sent = await sendKept(memberId, sendOnce);
      if (sent > 0) setSentNote(`Sent ${count(sent, "entry", "entries")} kept on this phone.`);
    } finally {
      await reload();
    }
  }, [memberId, reload]);
  // On every open and whenever the signal comes back.
  useEffect(() => {
    keepThisPageOffline();
    void sendWaiting();
    const online = () => void sendWaiting();
    window.addEventListener("online", online);
    return () => window.removeEventListener("online", online);
  }, [sendWaiting]);

  const [state, action, pending] = useActionState<FormState, FormData>(async (_previous, data) => {
    if (navigator.onLine) {
      try {
        const answer = await recordHarvestAction(initial, data);
        // A save that went through means there is a signal: send what waited for one.
        if (answer.status === "ok") void sendWaiting();
        return answer;
      } catch {
        // No answer (the signal dropped, or the server did): keep the entry with its key; if it was
        // stored after all, sending it again finds it and stores nothing new.
      }
    }
    const fields = fieldsOf(data);
    const clientKey = data.get("clientKey");
    try {
      if (typeof clientKey !== "string") throw new Error("The entry has no key.");
      await keepHarvest({ clientKey, memberId, keptAt: Date.now(), fields });
    } catch {
      return {
        status: "error",
        message: "Not saved: no signal, and this phone cannot keep entries (private browsing?). Write it down and save it later.",
      };
    }
    await reload();
    return { status: "kept", message: `Flush ${fields.flush} of ${fields.blockCode}: ${fields.weight} ${fields.unit}.` };
  }, initial);
  const [blockCode, setBlockCode] = useState(initialBlock);
  const sameBlock = (code: string) => code.trim().toLowerCase() === blockCode.trim().toLowerCase();
  const storedNext = targets.find((target) => sameBlock(target.code))?.nextFlush;
  // Flushes kept on the phone count too, so a round of the grow room without a signal goes 1, 2, 3.
  const keptFlushes = (kept ?? [])
    .filter((entry) => !entry.refused && sameBlock(entry.fields.blockCode))
    .map((entry) => Number(entry.fields.flush));
  const suggested = storedNext ? Math.max(storedNext, ...keptFlushes.map((flush) => flush + 1)) : undefined;
  const [flush, setFlush] = useState<string>(suggested ? String(suggested) : "");
  const [flushTouched, setFlushTouched] = useState(false);
  const shownFlush = flushTouched ? flush : suggested ? String(suggested) : flush;
  const [weight, setWeight] = useState("");
  // What this phone remembers is read after hydration (the server knows none of it); a choice made here wins.
  const keptUnit = useSyncExternalStore(
    nothingToWatch,
    () => remembered().unit ?? null,
    () => null,
  );
  const keptDay = useSyncExternalStore(
    nothingToWatch,
    () => remembered().harvestedOn ?? today(),
    () => "",
  );
  const [unitChoice, setUnitChoice] = useState<Unit | null>(null);
  const [dayChoice, setDayChoice] = useState<string | null>(null);
  const unit = unitChoice ?? keptUnit ?? defaultUnit;
  const harvestedOn = dayChoice ?? keptDay;
  // The block's room on the day picked, until the grower picks another: a move is recorded only when they differ.
  const [roomChoice, setRoomChoice] = useState<string | null>(null);
  const blockMoves = targets.find((target) => sameBlock(target.code))?.moves ?? [];
  const blockRoom = harvestedOn ? (roomOn(blockMoves, harvestedOn)?.roomId ?? "") : "";
  const roomId = roomChoice ?? (rooms.some((room) => room.id === blockRoom) ? blockRoom : "");
  // Warnings stand for the entry they were given for: changing a field takes "Save anyway" away.
  const [edited, setEdited] = useState(false);
  const [answered, setAnswered] = useState(state);
  if (answered !== state) {
    setAnswered(state);
    setEdited(false);
    if (state.status === "ok" || state.status === "kept") {
      setWeight("");
      setFlushTouched(false);
      setRoomChoice(null);
    }
  }
  const waiting = (kept ?? []).filter((entry) => !entry.refused);
  const refused = (kept ?? []).filter((entry) => entry.refused);

  /** A refused entry goes back into the form to be corrected and saved again; it leaves the phone's list. */
  const putBack = async (entry: QueuedHarvest) => {
    setBlockCode(entry.fields.blockCode);
    setFlush(entry.fields.flush);
    setFlushTouched(true);
    setWeight(entry.fields.weight);
    const entryUnit = units.find((choice) => choice === entry.fields.unit);
    if (entryUnit) setUnitChoice(entryUnit);
    setDayChoice(entry.fields.harvestedOn);
    setRoomChoice(entry.fields.roomId ?? "");
    changed();
    await dropKept(entry.clientKey);
    await reload();
  };
  const discard = async (entry: QueuedHarvest) => {
    await dropKept(entry.clientKey);
    await reload();
  };

  const warnings = state.status === "confirm" && !edited ? (state.warnings ?? []) : [];
  const warningsFor = (field: string) => warnings.filter((warning) => warning.field === field).map((warning) => warning.message);
  const changed = () => setEdited(true);

  return (
    <form
      onSubmit={(event) => {
        // Sent by hand rather than through the form's action: React resets a form after its action,
        // and a reset puts the unit picker back on its first option while the entry keeps its unit.
        event.preventDefault();
        const data = new FormData(event.currentTarget, event.nativeEvent.submitter);
        // Each entry's own key, made here: however often it is sent, it is stored once.
        data.set("clientKey", uuidv4());
        data.set("memberId", memberId);
        remember(unit, harvestedOn);
        startTransition(() => action(data));
      }}
      className="space-y-4 rounded-xl border border-oat-300 bg-white p-5 shadow-sm"
    >
      {state.status === "ok" ? (
        <Notice title="Saved">
          <p role="status">{state.message}</p>
        </Notice>
      ) : null}
      {state.status === "kept" && waiting.length > 0 ? (
        <Notice tone="caution" title="No signal: kept on this phone">
          <p>{state.message}</p>
        </Notice>
      ) : null}
      {sentNote && waiting.length === 0 ? (
        <Notice title="Sent">
          <p>{sentNote}</p>
        </Notice>
      ) : null}
      {waiting.length > 0 ? (
        <Notice tone="caution">
          <p role="status" data-testid="phone-queue" className="font-semibold">
            Saved on this phone, not sent yet ({waiting.length})
          </p>
          <p>They are sent when the phone has a signal again, and whenever this page opens.</p>
          <Button type="button" variant="secondary" onClick={() => void sendWaiting()}>
            Send now
          </Button>
        </Notice>
      ) : null}
      {refused.map((entry) => (
        <Notice
          key={entry.clientKey}
          tone="danger"
          title={`Not saved: flush ${entry.fields.flush} of ${entry.fields.blockCode}, ${entry.fields.weight} ${entry.fields.unit}`}
        >
          <p>{entry.refused?.message}</p>
          <ul className="list-disc pl-5">
            {entry.refused?.reasons.map((reason) => (
              <li key={reason}>{reason}</li>
            ))}
          </ul>
          <div className="flex flex-wrap gap-2 pt-1">
            <Button type="button" variant="secondary" onClick={() => void putBack(entry)}>
              Put back in the form
            </Button>
            <Button type="button" variant="secondary" onClick={() => void discard(entry)}>
              Discard
            </Button>
          </div>
        </Notice>
      ))}
      {state.status === "error" && state.message ? (
        <Notice tone="danger">
          <p>{state.message}</p>
        </Notice>
      ) : null}
      <Field
        label="Block code"
        name="blockCode"
        list="block-codes"
        autoComplete="off"
        autoCapitalize="characters"
        required
        value={blockCode}
        onChange={(event) => {
          setBlockCode(event.target.value);
          setFlushTouched(false);
          changed();
        }}
        errors={state.fieldErrors?.blockCode}
        hint="As written on the bag, in capitals or not; start typing to pick from your blocks."
      />
      <FieldWarnings name="blockCode" messages={warningsFor("blockCode")} />
      <datalist id="block-codes">
        {targets.map((target) => (
          <option key={target.code} value={target.code} />
        ))}
      </datalist>
      <Field
        label="Flush"
        name="flush"
        type="number"
        inputMode="numeric"
        min={1}
        max={20}
        required
        value={shownFlush}
        onChange={(event) => {
          setFlush(event.target.value);
          setFlushTouched(true);
          changed();
        }}
        errors={state.fieldErrors?.flush}
        hint={suggested ? `Flush ${suggested} is next for this block.` : undefined}
      />
      <FieldWarnings name="flush" messages={warningsFor("flush")} />
      <div className="grid grid-cols-[1fr_7rem] items-start gap-3">
        <Field
          label="Fresh weight"
          name="weight"
          type="text"
          inputMode="text"
          autoComplete="off"
          autoCapitalize="none"
          required
          value={weight}
          onChange={(event) => {
            setWeight(event.target.value);
            changed();
          }}
          errors={state.fieldErrors?.weight}
          placeholder="640"
          hint={`In ${unit}, or with its own unit: 1 lb 2 oz, 12 oz, 0,45 kg.`}
        />
        <div className="space-y-1">
          <label htmlFor="unit" className="block text-sm font-medium">
            Unit
          </label>
          <select
            id="unit"
            name="unit"
            value={unit}
            onChange={(event) => {
              setUnitChoice(event.target.value as Unit);
              changed();
            }}
            className="block min-h-11 w-full rounded-lg border border-oat-300 bg-white px-3 text-base"
          >
            {units.map((choice) => (
              <option key={choice} value={choice}>
                {choice}
              </option>
            ))}
          </select>
        </div>
      </div>
      <FieldWarnings name="weight" messages={warningsFor("weight")} />
      <Field
        label="Picked on"
        name="harvestedOn"
        type="date"
        required
        value={harvestedOn}
        onChange={(event) => {
          setDayChoice(event.target.value);
          changed();
        }}
        errors={state.fieldErrors?.harvestedOn}
      />
      <FieldWarnings name="harvestedOn" messages={warningsFor("harvestedOn")} />
      {rooms.length > 0 ? (
        <div className="space-y-1">
          <label htmlFor="roomId" className="block text-sm font-medium">
            Room it is in now (optional)
          </label>
          <select
            id="roomId"
            name="roomId"
            value={roomId}
            aria-describedby={state.fieldErrors?.roomId?.length ? "roomId-errors roomId-hint" : "roomId-hint"}
            onChange={(event) => {
              setRoomChoice(event.target.value);
              changed();
            }}
            className="block min-h-11 w-full rounded-lg border border-oat-300 bg-white px-3 text-base"
          >
            <option value="">Not saying</option>
            {rooms.map((room) => (
              <option key={room.id} value={room.id}>
                {room.name}
              </option>
            ))}
          </select>
          <p id="roomId-hint" className="text-xs text-ink-soft">
            If the block is in another room than recorded, it is recorded as moved there on the day picked.
          </p>
          {state.fieldErrors?.roomId?.length ? (
            <ul id="roomId-errors" className="text-sm text-danger-ink">
              {state.fieldErrors.roomId.map((error) => (
                <li key={error}>{error}</li>
              ))}
            </ul>
          ) : null}
        </div>
      ) : null}
      {warnings.length > 0 ? (
        <Notice tone="caution" title="Not saved yet">
          <p>{state.message}</p>
          <p>If the entry is right as it is, save it anyway: the warning is kept with the harvest and shown on the block&apos;s page.</p>
          <Button type="submit" name="acceptWarnings" value={warnings.map((warning) => warning.code).join(",")} disabled={pending}>
            Save anyway
          </Button>
        </Notice>
      ) : null}
      <Button type="submit" disabled={pending} className="w-full" variant={warnings.length > 0 ? "secondary" : "primary"}>
        {pending ? "Saving…" : warnings.length > 0 ? "Check again" : "Save this flush"}
      </Button>
    </form>
  );
}

/** A field's warnings, under it, in the caution colours. */
function FieldWarnings({ name, messages }: { name: string; messages: string[] }) {
  if (messages.length === 0) return null;
  return (
    <ul id={`${name}-warnings`} className="-mt-2 text-sm text-caution-ink" data-testid={`${name}-warnings`}>
      {messages.map((message) => (
        <li key={message}>Check: {message}</li>
      ))}
    </ul>
  );
}

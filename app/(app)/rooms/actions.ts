"use server";

import { revalidatePath } from "next/cache";
import { redirect } from "next/navigation";
import { guardedAction } from "@/lib/auth/guard";
import { addRoom, editRoom, recordRegimeChange, setRoomRetirement } from "@/lib/data/rooms";
import { regimeChangeSchema, roomEditSchema, roomRetirementSchema, roomSchema } from "@/lib/rooms/schemas";
import { count } from "@/lib/words";

export const addRoomAction = guardedAction("rooms:record", roomSchema, async (input, member) => {
  const { id } = await addRoom(member, input);
  revalidatePath("/rooms", "layout");
  // Straight to the new room, where its first regime is recorded.
  redirect(`/rooms/${id}?added=1`);
});

export const editRoomAction = guardedAction("rooms:manage", roomEditSchema, async (input, member) => {
  const changed = await editRoom(member, input);
  revalidatePath("/rooms", "layout");
  return {
    status: "ok",
    message: changed === 0 ? "Nothing changed: the room is as stored." : `Saved ${count(changed, "changed value")}.`,
  };
});

export const retireRoomAction = guardedAction("rooms:manage", roomRetirementSchema, async (input, member) => {
  await setRoomRetirement(member, input);
  revalidatePath("/rooms", "layout");
  return { status: "ok", message: input.retiredOn ? "The room is retired; its history stays." : "The room is in use again." };
});

export const recordRegimeAction = guardedAction("rooms:record", regimeChangeSchema, async (input, member) => {
  await recordRegimeChange(member, input);
  revalidatePath("/rooms", "layout");
  return { status: "ok", message: "Saved. The change is in the room's regime history below." };
});

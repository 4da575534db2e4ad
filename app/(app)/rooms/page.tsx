import type { Metadata } from "next";
import Link from "next/link";
import { ActionForm } from "@/components/forms/action-form";
import { Caution } from "@/components/ui/caution";
import { PageHeader } from "@/components/ui/page-header";
import { ScrollFrame } from "@/components/ui/scroll-frame";
import { requirePage } from "@/lib/auth/guard";
import { can } from "@/lib/auth/permissions";
import { listRooms } from "@/lib/data/rooms";
import { roomFreshAirLabels, roomKindLabels, sizeInWords } from "@/lib/rooms/lists";
import { calendarDateIn, formatDate } from "@/lib/time/display";
import { timeDisplayFor } from "@/lib/time/member-display";
import { addRoomAction } from "./actions";
import { roomFormFields } from "./_components/form-fields";

export const metadata: Metadata = { title: "Fruiting rooms" };

export default async function RoomsPage() {
  const member = await requirePage("farm-data:read");
  const times = await timeDisplayFor(member);
  const today = calendarDateIn(new Date(), times.timeZone);
  const rooms = await listRooms(member, today);
  return (
    <>
      <PageHeader
        title="Fruiting rooms"
        lead="The tubs, tents and rooms your blocks fruit in, and how each is run. Every flush can then be matched to the room and regime it grew under. Only your farm's people see these rows."
      />
      <div className="space-y-6">
        {rooms.length === 0 ? (
          <p className="text-ink-soft">No rooms yet. Add the first below.</p>
        ) : (
          <ScrollFrame label="Your fruiting rooms" className="rounded-lg border border-oat-300 bg-white">
            <table className="min-w-full text-sm" data-testid="rooms-table">
              <caption className="sr-only">Your fruiting rooms</caption>
              <thead className="bg-oat-200 text-left">
                <tr>
                  {["Room", "Kind", "Size", "Fresh air", "Run today", "Blocks in it now"].map((header) => (
                    <th key={header} scope="col" className="px-3 py-2">
                      {header}
                    </th>
                  ))}
                </tr>
              </thead>
              <tbody>
                {rooms.map((room) => (
                  <tr key={room.id} className="border-t border-oat-200 align-top">
                    <td className="px-3 py-2">
                      <Link href={`/rooms/${room.id}`} className="inline-flex min-h-11 items-center font-semibold text-moss-700 underline">
                        {room.name}
                      </Link>
                      {room.retiredOn ? (
                        <span className="block text-ink-soft">retired {formatDate(room.retiredOn, member.dateStyle)}</span>
                      ) : null}
                    </td>
                    <td className="px-3 py-2">{roomKindLabels[room.kind]}</td>
                    <td className="px-3 py-2">{sizeInWords(room.volumeM3)}</td>
                    <td className="px-3 py-2">{roomFreshAirLabels[room.freshAir]}</td>
                    <td className="px-3 py-2">
                      {room.regimeToday ?? <span className="text-ink-soft">no regime recorded for today</span>}
                      {room.regimeKindToday ? <span className="block text-ink-soft">{room.regimeKindToday}</span> : null}
                    </td>
                    <td className="px-3 py-2">{room.blocksNow.length}</td>
                  </tr>
                ))}
              </tbody>
            </table>
          </ScrollFrame>
        )}
        {can(member.role, "rooms:record") ? (
          <details className="rounded-lg border border-oat-300 bg-white p-4" open={rooms.length === 0}>
            <summary className="min-h-11 cursor-pointer content-center font-semibold text-moss-700">Add a room</summary>
            <div className="mt-3 max-w-lg">
              <ActionForm action={addRoomAction} testId="add-room" fields={roomFormFields()} submitLabel="Add the room" />
            </div>
          </details>
        ) : null}
        <Caution which="humidifiers" />
        <Caution which="carbonDioxide" />
      </div>
    </>
  );
}

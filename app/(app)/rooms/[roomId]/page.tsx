import type { Metadata } from "next";
import Link from "next/link";
import { notFound } from "next/navigation";
import { ActionForm } from "@/components/forms/action-form";
import { ButtonLink } from "@/components/ui/button";
import { Card } from "@/components/ui/card";
import { Caution } from "@/components/ui/caution";
import { Notice } from "@/components/ui/notice";
import { PageHeader } from "@/components/ui/page-header";
import { requirePage } from "@/lib/auth/guard";
import { can } from "@/lib/auth/permissions";
import { getRoom, listRegimeKinds, type RoomDetail } from "@/lib/data/rooms";
import { isAppError } from "@/lib/errors";
import { roomFreshAirLabels, roomKindLabels, sizeInWords } from "@/lib/rooms/lists";
import { calendarDateIn, formatDate } from "@/lib/time/display";
import { timeDisplayFor } from "@/lib/time/member-display";
import { editRoomAction, recordRegimeAction, retireRoomAction } from "../actions";
import { regimeFormFields, roomFormFields } from "../_components/form-fields";

export const metadata: Metadata = { title: "Fruiting room" };

export default async function RoomPage({
  params,
  searchParams,
}: {
  params: Promise<{ roomId: string }>;
  searchParams: Promise<{ added?: string }>;
}) {
  const member = await requirePage("farm-data:read");
  const { roomId } = await params;
  const { added } = await searchParams;
  const times = await timeDisplayFor(member);
  const today = calendarDateIn(new Date(), times.timeZone);
  let room: RoomDetail;
  try {
    room = await getRoom(member, roomId, today);
  } catch (error) {
    if (isAppError(error) && error.code === "not_found") notFound();
    throw error;
  }
  const kinds = await listRegimeKinds(member);
  const date = (day: string) => formatDate(day, member.dateStyle);
  const facts = [
    ["What it is", roomKindLabels[room.kind]],
    ["Inside size", sizeInWords(room.volumeM3)],
    ["Fresh air", roomFreshAirLabels[room.freshAir]],
    ["Run today", room.regimeToday ?? "no regime recorded for today"],
    ["In use", room.retiredOn ? `no, retired ${date(room.retiredOn)}` : "yes"],
  ];
  const newestFirst = [...room.regimes].reverse();
  return (
    <>
      <PageHeader title={room.name} lead={room.notes || undefined}>
        <ButtonLink href="/rooms" variant="secondary">
          All rooms
        </ButtonLink>
        <ButtonLink href={`/rooms/${room.id}/climate`} variant="secondary">
          Climate log
        </ButtonLink>
      </PageHeader>
      <div className="space-y-6">
        {added ? (
          <Notice title="Room added">
            <p role="status">Now record how it is run: the humidity schedule, fresh air, set temperature and cleaning.</p>
          </Notice>
        ) : null}
        <Card title="The room">
          <dl className="grid grid-cols-1 gap-x-6 gap-y-2 text-sm sm:grid-cols-[12rem_1fr]">
            {facts.map(([label, value]) => (
              <div key={label} className="contents">
                <dt className="text-ink-soft">{label}</dt>
                <dd className="font-medium">{value}</dd>
              </div>
            ))}
          </dl>
        </Card>
        <Card title="How it has been run">
          {newestFirst.length === 0 ? (
            <p className="text-ink-soft">No regime recorded yet.</p>
          ) : (
            <ol className="space-y-2 text-sm" data-testid="regime-history">
              {newestFirst.map((regime) => (
                <li key={regime.id} className="rounded-lg bg-oat-50 p-3">
                  <span className="block font-semibold">
                    In force from {date(regime.startsOn)} {regime.until ? `to ${date(regime.until)}` : "(still in force)"}
                  </span>
                  {regime.words}
                  {regime.regimeKind ? <span className="block text-ink-soft">Climate regime: {regime.regimeKind}</span> : null}
                  {regime.notes ? <span className="block">Notes: {regime.notes}</span> : null}
                  {regime.recordedBy ? <span className="block text-ink-soft">Recorded by {regime.recordedBy}</span> : null}
                </li>
              ))}
            </ol>
          )}
        </Card>
        {can(member.role, "rooms:record") ? (
          <Card title="Record a change of regime">
            <p className="mb-4 text-sm text-ink-soft">
              A change is in force from its day until the next change. Fill in the fields of the humidity mode you pick; leave the other
              mode&apos;s blank.
            </p>
            <div className="mb-4 space-y-3">
              <Caution which="humidifiers" />
              <Caution which="carbonDioxide" />
              <Caution which="alcoholCleaning" />
              <Caution which="roomCleaning" />
            </div>
            <div className="max-w-lg">
              <ActionForm
                action={recordRegimeAction}
                testId="record-regime"
                hidden={{ roomId: room.id }}
                fields={regimeFormFields(kinds, today)}
                submitLabel="Save the change"
              />
            </div>
          </Card>
        ) : null}
        <Card title="Blocks in it now">
          {room.blocksNow.length === 0 ? (
            <p className="text-ink-soft">No block still fruiting is in this room today. Move one from its block page.</p>
          ) : (
            <ul className="flex flex-wrap gap-2 text-sm" data-testid="blocks-in-room">
              {room.blocksNow.map((block) => (
                <li key={block.id}>
                  <Link href={`/blocks/${block.id}`} className="inline-flex min-h-11 items-center rounded-lg bg-oat-50 px-3 underline">
                    {block.code}
                  </Link>
                </li>
              ))}
            </ul>
          )}
          <p className="mt-2 text-xs text-ink-soft">Finished (spent mass weighed) and contaminated blocks are not counted.</p>
        </Card>
        {can(member.role, "rooms:manage") ? (
          <Card title="Change or retire the room">
            <div className="max-w-lg space-y-6">
              <ActionForm
                action={editRoomAction}
                testId="edit-room"
                hidden={{ roomId: room.id }}
                fields={roomFormFields(room)}
                submitLabel="Save the room"
              />
              {room.retiredOn ? (
                <ActionForm
                  action={retireRoomAction}
                  testId="reinstate-room"
                  hidden={{ roomId: room.id, retiredOn: "" }}
                  submitLabel="Take back into use"
                  variant="secondary"
                />
              ) : (
                <ActionForm
                  action={retireRoomAction}
                  testId="retire-room"
                  hidden={{ roomId: room.id }}
                  fields={[{ name: "retiredOn", label: "Retired from", type: "date", defaultValue: today }]}
                  submitLabel="Retire the room"
                  variant="secondary"
                />
              )}
            </div>
          </Card>
        ) : null}
      </div>
    </>
  );
}

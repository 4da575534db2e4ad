import { ActionForm } from "@/components/forms/action-form";
import { Caution } from "@/components/ui/caution";
import { count } from "@/lib/words";
import { respondToInvitationAction } from "../actions";

/** A room-level trial's accept form: the farm picks which of its own fruiting rooms take part. */
export function RoomPickForm(props: {
  trialId: string;
  arms: number;
  blocksPerRoom: number | null;
  rooms: { id: string; name: string }[];
}) {
  const { trialId, arms, blocksPerRoom, rooms } = props;
  if (rooms.length < arms)
    return (
      <p className="text-sm" data-testid="room-pick-too-few">
        This trial draws your fruiting rooms to its {arms} arms, so your farm needs at least {count(arms, "room")} in use; it has{" "}
        {rooms.length}. Add your rooms on the Rooms page, then come back to accept.
      </p>
    );
  return (
    <ActionForm
      action={respondToInvitationAction}
      hidden={{ trialId, answer: "accept", roomDraw: "yes" }}
      submitLabel="Accept and draw our rooms"
    >
      <fieldset className="space-y-2">
        <legend className="text-sm font-medium">Fruiting rooms that take part (at least one for each of the {arms} arms)</legend>
        {rooms.map((room) => (
          <label key={room.id} className="flex min-h-11 items-center gap-3 text-sm">
            <input type="checkbox" name={`room:${room.id}`} className="h-5 w-5" />
            {room.name}
          </label>
        ))}
      </fieldset>
      <p className="text-sm text-ink-soft">
        Your rooms, not single blocks, are drawn at random to the arms, the same number of rooms to each arm where they divide evenly.
        {blocksPerRoom ? ` Each room then gets ${count(blocksPerRoom, "block")} on your list.` : ""} Only your farm sees which room is
        which; the coordinator sees counts.
      </p>
    </ActionForm>
  );
}

/** After the draw: which room runs which arm's regime, in plain words, with the cautions of running rooms. */
export function RoomDrawTable({
  draw,
}: {
  draw: { sequence: number; roomName: string; armLabel: string; strainName: string; regimeName: string | null }[];
}) {
  if (!draw.length) return null;
  return (
    <div className="my-4 space-y-3" data-testid="room-draw">
      <p className="text-sm">
        Run each room under its arm&apos;s climate regime for the whole trial, and put in each room only the blocks the list gives it: the
        room is what is compared, so a block carried into another arm&apos;s room no longer counts for either.
      </p>
      <table className="w-full text-sm [&_td]:pr-3 [&_th]:pr-3">
        <thead>
          <tr className="text-left">
            <th scope="col" className="py-1">
              Room
            </th>
            <th scope="col">Arm</th>
            <th scope="col">Climate regime to run</th>
          </tr>
        </thead>
        <tbody>
          {draw.map((room) => (
            <tr key={room.sequence} className="border-t border-oat-300">
              <th scope="row" className="py-2 text-left font-normal">
                {room.roomName}
              </th>
              <td>
                {room.armLabel} ({room.strainName})
              </td>
              <td>{room.regimeName ?? "–"}</td>
            </tr>
          ))}
        </tbody>
      </table>
      <Caution which="humidifiers" />
      <Caution which="carbonDioxide" />
    </div>
  );
}

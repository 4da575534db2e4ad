import { Card } from "@/components/ui/card";
import { roomUnitSentence, type PublishedRoomAnalysis } from "@/lib/trials/room-analysis";
import { DifferenceRow } from "./factorial-results";

const fmt = (value: number, digits = 1) => value.toFixed(digits);
const pText = (p: number) => (p < 0.001 ? "< 0.001" : fmt(p, 3));

/** A room-level trial's analysis: room means with farm as block; counts of rooms, never one room's mean. */
export function RoomResults({ rooms, referenceArm }: { rooms: PublishedRoomAnalysis; referenceArm: string }) {
  const arms = rooms.roomsPerArm.length;
  return (
    <Card title="Biological efficiency by arm, rooms as the unit">
      <p className="text-sm" data-testid="room-unit">
        {roomUnitSentence(rooms)}
      </p>
      {rooms.notes.map((note) => (
        <p key={note} className="mt-2 text-sm">
          {note}
        </p>
      ))}
      {rooms.anova ? (
        <>
          <table className="mt-4 w-full text-sm [&_td]:pr-3 [&_th]:pr-3">
            <thead>
              <tr className="text-left">
                <th scope="col" className="py-1">
                  Arm
                </th>
                <th scope="col">Rooms</th>
                <th scope="col">Farm-adjusted mean of room means (BE)</th>
                <th scope="col">95 % interval</th>
              </tr>
            </thead>
            <tbody>
              {rooms.adjustedMeans.map((mean) => (
                <tr key={mean.treatment} className="border-t border-oat-300">
                  <th scope="row" className="py-2 text-left">
                    {mean.treatment}
                    {mean.treatment === referenceArm ? " (reference)" : ""}
                  </th>
                  <td>{rooms.roomsPerArm.find((arm) => arm.label === mean.treatment)?.rooms ?? "–"}</td>
                  <td>{fmt(mean.estimate)} %</td>
                  <td>
                    {fmt(mean.lower)} – {fmt(mean.upper)} %
                  </td>
                </tr>
              ))}
            </tbody>
          </table>
          <p className="mt-2 text-sm text-ink-soft">
            Do the arms differ, once farms are allowed for? F = {fmt(rooms.anova.arm.f, 2)} on {rooms.anova.arm.df} and{" "}
            {rooms.anova.residualDf} degrees of freedom (rooms, not blocks), p {pText(rooms.anova.arm.p)}.
          </p>
        </>
      ) : null}
      {rooms.versusReference.length ? (
        <table className="mt-4 w-full text-sm [&_td]:pr-3 [&_th]:pr-3">
          <caption className="mb-2 text-left text-ink-soft">
            Difference between two arms&apos; farm-adjusted means of room means. Intervals and p-values allow for comparing all{" "}
            {(arms * (arms - 1)) / 2} pairs of arms (Tukey).
          </caption>
          <thead>
            <tr className="text-left">
              <th scope="col" className="py-1">
                Comparison
              </th>
              <th scope="col">Difference (BE points)</th>
              <th scope="col">95 % interval (Tukey)</th>
              <th scope="col">p, adjusted for all pairs (Tukey)</th>
            </tr>
          </thead>
          <tbody>
            {[...rooms.versusReference, ...rooms.betweenArms].map((row) => (
              <DifferenceRow key={`${row.arm}-${row.versus}`} label={`${row.arm} − ${row.versus}`} difference={row} bold />
            ))}
          </tbody>
        </table>
      ) : null}
    </Card>
  );
}

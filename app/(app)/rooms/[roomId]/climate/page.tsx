import type { Metadata } from "next";
import Link from "next/link";
import { notFound } from "next/navigation";
import { ClimateChart } from "@/components/charts/climate-chart";
import { ActionForm } from "@/components/forms/action-form";
import { Card } from "@/components/ui/card";
import { Caution } from "@/components/ui/caution";
import { PageHeader } from "@/components/ui/page-header";
import { ScrollFrame } from "@/components/ui/scroll-frame";
import { requirePage } from "@/lib/auth/guard";
import { can } from "@/lib/auth/permissions";
import { chartSeries } from "@/lib/climate/chart";
import { dryBelowPercent, summaryInWords, wetAbovePercent } from "@/lib/climate/summary";
import { startOfDay } from "@/lib/climate/windows";
import { loggerClockZones } from "@/lib/climate/zones";
import { getRoomClimate, type RoomClimate } from "@/lib/data/climate";
import { isAppError } from "@/lib/errors";
import { formatDate, formatDateTime } from "@/lib/time/display";
import { timeDisplayFor } from "@/lib/time/member-display";
import { count } from "@/lib/words";
import { uploadClimateLogAction } from "./actions";

export const metadata: Metadata = { title: "Room climate" };

const uuid = /^[0-9a-f]{8}-[0-9a-f]{4}-[0-9a-f]{4}-[0-9a-f]{4}-[0-9a-f]{12}$/i;

export default async function RoomClimatePage({ params }: { params: Promise<{ roomId: string }> }) {
  const member = await requirePage("farm-data:read");
  const { roomId } = await params;
  if (!uuid.test(roomId)) notFound();
  const display = await timeDisplayFor(member);
  let climate: RoomClimate;
  try {
    climate = await getRoomClimate(member, roomId, display.timeZone);
  } catch (error) {
    if (isAppError(error) && error.code === "not_found") notFound();
    throw error;
  }
  const { room, logs, readings, regimeStarts, windows } = climate;
  const series = chartSeries(readings);
  const marks = regimeStarts.map((day) => ({
    at: startOfDay(day, display.timeZone),
    label: `Regime from ${formatDate(day, member.dateStyle)}`,
  }));
  const memberZone = member.timeZone ?? display.timeZone;
  return (
    <>
      <PageHeader
        title={`Climate: ${room.name}`}
        lead="Upload what the room's temperature and humidity logger recorded, see it over time, and what each flush grew in."
      >
        <Link href={`/rooms/${room.id}`} className="text-moss-700 underline">
          Back to the room
        </Link>
      </PageHeader>
      <div className="space-y-6">
        <Caution which="carbonDioxide" />
        <Card title="The room's log">
          {readings.length === 0 ? (
            <p className="text-ink-soft">No climate log for this room yet.</p>
          ) : (
            <ClimateChart humidity={series.humidity} temperature={series.temperature} marks={marks} display={display} />
          )}
        </Card>
        <Card title="Each flush's climate">
          <p className="mb-3 text-sm text-ink-soft">
            A flush&apos;s window runs from the day after the block&apos;s previous harvest (or the day it was moved into this room, if
            later) to the end of its harvest day, in {display.timeZone}. Wet means above {wetAbovePercent} % RH; a dry spell is an unbroken
            time under {dryBelowPercent} % RH; the mean temperature is weighted by time. No figures where the log covers less than 80 % of a
            window. A first flush of a block that was in this room from the start of fruiting has no window: the day fruiting began is not
            recorded (record the day it was moved in on the block&apos;s page).
          </p>
          {windows.length === 0 ? (
            <p className="text-ink-soft">No flush has been picked from a block in this room yet.</p>
          ) : readings.length === 0 ? (
            // Without a log every window would only say so: one line instead of a table of the same words.
            <p className="text-ink-soft">
              {count(windows.length, "flush has", "flushes have")} been picked from blocks in this room. Upload the room&apos;s logger file
              below to see the climate each one grew in.
            </p>
          ) : (
            <ScrollFrame label="Climate per flush window">
              <table className="min-w-full text-sm">
                <caption className="sr-only">Climate per flush window in {room.name}</caption>
                <thead className="bg-oat-200 text-left">
                  <tr>
                    <th scope="col" className="px-3 py-2">
                      Block
                    </th>
                    <th scope="col" className="px-3 py-2">
                      Flush
                    </th>
                    <th scope="col" className="px-3 py-2">
                      Window
                    </th>
                    <th scope="col" className="px-3 py-2">
                      Climate
                    </th>
                  </tr>
                </thead>
                <tbody>
                  {windows.map((window) => (
                    <tr key={`${window.blockId}-${window.flush}`} className="border-t border-oat-200 align-top">
                      <td className="px-3 py-2">
                        <Link href={`/blocks/${window.blockId}`} className="text-moss-700 underline">
                          {window.code}
                        </Link>
                      </td>
                      <td className="px-3 py-2">{window.flush}</td>
                      <td className="px-3 py-2">
                        {window.fromDay === null
                          ? `to ${formatDate(window.harvestedOn, member.dateStyle)}`
                          : `${formatDate(window.fromDay, member.dateStyle)} – ${formatDate(window.harvestedOn, member.dateStyle)}`}
                      </td>
                      <td className="px-3 py-2">
                        {window.summary === null
                          ? "No start known (the day fruiting began is not recorded)"
                          : summaryInWords(window.summary)}
                      </td>
                    </tr>
                  ))}
                </tbody>
              </table>
            </ScrollFrame>
          )}
        </Card>
        {can(member.role, "climate-log:upload") ? (
          <Card title="Upload a logger file">
            <p className="mb-3 text-sm text-ink-soft">
              A CSV from the logger: a time column, temperature (°C or °F) and relative humidity, CO2 in ppm if it has it. Nothing is
              guessed: if the file leaves the date order, the decimal mark or the temperature unit open, you are asked to choose. Readings
              in times an earlier log of this room already covers are left out. Up to 1.9 MB a file.
            </p>
            <ActionForm
              action={uploadClimateLogAction}
              testId="climate-upload"
              submitLabel="Upload"
              pendingLabel="Reading the file…"
              hidden={{ roomId: room.id }}
              fields={[
                { name: "file", label: "Logger file (CSV)", type: "file" },
                {
                  name: "timeZone",
                  label: "The logger's clock was in",
                  options: loggerClockZones(),
                  defaultValue: memberZone,
                  hint: "Many loggers ignore summer time: choose a UTC offset all year for those.",
                },
                {
                  name: "dateOrder",
                  label: "Date order",
                  options: [
                    { value: "file", label: "As the file settles it" },
                    { value: "dmy", label: "Day first (21/03/2026)" },
                    { value: "mdy", label: "Month first (03/21/2026)" },
                  ],
                },
                {
                  name: "decimal",
                  label: "Decimal mark",
                  options: [
                    { value: "file", label: "As the file settles it" },
                    { value: ".", label: "Point (18.5)" },
                    { value: ",", label: "Comma (18,5)" },
                  ],
                },
                {
                  name: "temperatureUnit",
                  label: "Temperature unit",
                  options: [
                    { value: "file", label: "As the file's header says" },
                    { value: "C", label: "°C" },
                    { value: "F", label: "°F" },
                  ],
                },
              ]}
            />
          </Card>
        ) : null}
        <Card title="Logs uploaded">
          {logs.length === 0 ? (
            <p className="text-ink-soft">None yet.</p>
          ) : (
            <ul className="space-y-2 text-sm">
              {logs.map((log) => (
                <li key={log.id}>
                  <span className="font-medium">{log.fileName}</span>: {log.readingCount} readings from{" "}
                  {formatDateTime(log.firstAt, display)} to {formatDateTime(log.lastAt, display)}; {log.shape}; clock in {log.timeZone}.
                  Uploaded {formatDateTime(log.uploadedAt, display)}
                  {log.uploadedBy ? ` by ${log.uploadedBy}` : ""}.
                </li>
              ))}
            </ul>
          )}
        </Card>
      </div>
    </>
  );
}

import type { Metadata } from "next";
import Link from "next/link";
import { Card } from "@/components/ui/card";
import { PageHeader } from "@/components/ui/page-header";
import { requirePage } from "@/lib/auth/guard";
import { getCoordinatorHome } from "@/lib/data/trial-timeline";
import { formatDate, formatDateTime } from "@/lib/time/display";
import { timeDisplayFor } from "@/lib/time/member-display";
import { TrialTimelineBar } from "../trials/_components/trial-timeline";

export const metadata: Metadata = { title: "Follow-up" };

/** The coordinator's landing page: what needs attention this week, and every running trial's farms in counts and dates. */
export default async function CoordinatorHomePage() {
  const member = await requirePage("trial:follow-all-farms");
  const [home, display] = await Promise.all([getCoordinatorHome(member), timeDisplayFor(member)]);
  // In the coordinator's zone and date style, as every page writes them.
  const dateTime = (value: Date | null) => (value ? formatDateTime(value, display) : "none");
  const date = (value: string | null) => (value ? formatDate(value, display.dateStyle) : "none");
  return (
    <>
      <PageHeader
        title="Follow-up"
        lead="What needs attention in the seven days from today, and where each farm's records stand in every running trial. Counts and dates only: no farm's weights or efficiencies are shown here."
      />
      <div className="space-y-6">
        <Card title="Needs attention this week">
          {home.attention.length === 0 ? (
            <p className="text-sm text-ink-soft">
              Nothing: no farm is behind, and no due date or enrolment deadline falls in the next seven days.
            </p>
          ) : (
            <ul className="space-y-2 text-sm" data-testid="attention">
              {home.attention.map((item, index) => (
                <li key={index}>
                  <time dateTime={item.date} className="font-mono text-ink-soft">
                    {date(item.date)}
                  </time>{" "}
                  <Link href={`/trials/${item.trialId}`} className="font-medium text-moss-700 underline">
                    {item.trialCode}
                  </Link>{" "}
                  {item.text}
                </li>
              ))}
            </ul>
          )}
        </Card>
        {home.running.length === 0 ? (
          <Card title="Running trials">
            <p className="text-sm text-ink-soft">No trial is running.</p>
          </Card>
        ) : null}
        {home.running.map((trial) => (
          <Card key={trial.id} title={`${trial.code}: ${trial.title}`}>
            <TrialTimelineBar timeline={trial.timeline} today={home.today} />
            <div className="mt-4 overflow-x-auto" tabIndex={0} role="region" aria-label={`Farms of ${trial.code}`}>
              <table className="w-full min-w-[48rem] text-sm [&_td]:pr-3 [&_th]:pr-3" data-testid={`farm-status-${trial.code}`}>
                <caption className="sr-only">Where each farm&apos;s records of {trial.code} stand</caption>
                <thead>
                  <tr className="text-left">
                    <th scope="col" className="py-2">
                      Farm
                    </th>
                    <th scope="col">Blocks (of listed)</th>
                    <th scope="col">Last inoculated</th>
                    <th scope="col">Harvests</th>
                    <th scope="col">Last harvest</th>
                    <th scope="col">Uploads</th>
                    <th scope="col">Last upload</th>
                    <th scope="col">Against the timeline</th>
                    <th scope="col">Last reminded</th>
                  </tr>
                </thead>
                <tbody>
                  {trial.farms.map((farm) => (
                    <tr key={farm.enrolmentId} className="border-t border-oat-300 align-top">
                      <th scope="row" className="py-2 text-left font-medium">
                        {farm.farmName}
                      </th>
                      <td>
                        {farm.progress.blocksMade} of {farm.progress.blocksListed}
                      </td>
                      <td>{date(farm.lastInoculatedOn)}</td>
                      <td>{farm.harvests}</td>
                      <td>{date(farm.lastHarvestedOn)}</td>
                      <td>{farm.uploads}</td>
                      <td>{dateTime(farm.lastUploadAt)}</td>
                      <td>
                        {farm.behind.length
                          ? `Behind: ${farm.behind.join("; ")}`
                          : farm.missing.length
                            ? `On time; still to come: ${farm.missing.join("; ")}`
                            : "Complete"}
                      </td>
                      <td>{farm.remindersAllowed ? dateTime(farm.lastRemindedAt) : "Asked for no reminders"}</td>
                    </tr>
                  ))}
                </tbody>
              </table>
            </div>
            <p className="mt-3 text-sm">
              <Link href={`/trials/${trial.id}`} className="text-moss-700 underline">
                Open {trial.code}
              </Link>
            </p>
          </Card>
        ))}
      </div>
    </>
  );
}

import type { Metadata } from "next";
import Link from "next/link";
import { ButtonLink } from "@/components/ui/button";
import { Card } from "@/components/ui/card";
import { PageHeader } from "@/components/ui/page-header";
import { requirePage } from "@/lib/auth/guard";
import { can } from "@/lib/auth/permissions";
import { listTrials } from "@/lib/data/trials";
import { trialStatusLabels } from "@/lib/trials/lifecycle";
import { StatusBadge } from "./_components/status-badge";
import { formatDate } from "@/lib/time/display";

export const metadata: Metadata = { title: "Trials" };

const enrolmentLabels: Record<string, string> = {
  invited: "Your farm is invited",
  accepted: "Your farm takes part",
  declined: "Your farm declined",
  dropped: "Your farm is not taking part",
};

export default async function TrialsPage() {
  const member = await requirePage("trial:read");
  const rows = await listTrials(member);
  return (
    <>
      <PageHeader title="Trials" lead="Strain trials run across member farms, with blocks randomised to arms on every farm.">
        {can(member.role, "trial:manage") ? <ButtonLink href="/trials/new">Design a trial</ButtonLink> : null}
      </PageHeader>
      {rows.length === 0 ? (
        <Card>
          <p className="text-ink-soft">
            {can(member.role, "trial:manage") ? "No trials yet. Design the first one." : "No trials are open or published yet."}
          </p>
        </Card>
      ) : (
        <ul className="grid grid-cols-1 gap-4 md:grid-cols-2">
          {rows.map((trial) => (
            <li key={trial.id}>
              <Card>
                <div className="flex flex-wrap items-center justify-between gap-2">
                  <span className="font-mono text-sm text-ink-soft">{trial.code}</span>
                  <StatusBadge status={trial.status} />
                </div>
                <h2 className="mt-2 text-lg font-semibold text-moss-800">
                  <Link href={`/trials/${trial.id}`} className="underline-offset-4 hover:underline">
                    {trial.title}
                  </Link>
                </h2>
                <p className="text-sm text-ink-soft">
                  {trial.speciesName}
                  {trial.status === "open" && trial.enrolmentDeadline
                    ? ` · answer by ${formatDate(trial.enrolmentDeadline, member.dateStyle)}`
                    : ""}
                </p>
                {trial.enrolmentStatus ? (
                  <p className="mt-1 text-sm font-medium text-moss-700">{enrolmentLabels[trial.enrolmentStatus]}</p>
                ) : null}
                {trial.status === "published" ? (
                  <Link
                    href={`/trials/${trial.id}/results`}
                    className="mt-2 inline-flex min-h-11 items-center text-sm font-semibold text-moss-700 underline"
                  >
                    Read the results
                  </Link>
                ) : null}
                <span className="sr-only">Status: {trialStatusLabels[trial.status]}</span>
              </Card>
            </li>
          ))}
        </ul>
      )}
    </>
  );
}

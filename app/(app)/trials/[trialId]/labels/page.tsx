import type { Metadata } from "next";
import { trialOrNotFound } from "../../_components/trial-or-not-found";
import { Notice } from "@/components/ui/notice";
import { PageHeader } from "@/components/ui/page-header";
import { requirePage } from "@/lib/auth/guard";
import { listOwnAssignments } from "@/lib/data/trials";
import { PrintButton } from "../../_components/print-button";

export const metadata: Metadata = { title: "Label sheet" };

export default async function LabelSheetPage({ params }: { params: Promise<{ trialId: string }> }) {
  const member = await requirePage("trial-list:download");
  const { trialId } = await params;
  const trial = await trialOrNotFound(member, trialId);
  const list = await listOwnAssignments(member, trialId);
  return (
    <>
      <PageHeader
        title={`Label sheet — ${trial.code}`}
        lead="Print on plain paper or label stock, cut along the lines, and tape each label onto its bag."
      >
        {list.length ? <PrintButton /> : null}
      </PageHeader>
      {list.length === 0 ? (
        <Notice>Your farm has no list for this trial yet. Accept the invitation on the trial page first.</Notice>
      ) : (
        <div className="label-sheet grid grid-cols-1 gap-0 sm:grid-cols-2 print:grid-cols-2" data-testid="label-sheet">
          {list.map((entry) => (
            <div key={entry.blockCode} className="label border border-dashed border-ink bg-white p-4 text-ink">
              <p className="font-mono text-3xl font-bold tracking-wide">{entry.blockCode}</p>
              <p className="mt-1 text-2xl font-semibold">Arm {entry.armLabel}</p>
              <p className="text-base">
                {entry.strainCode}
                {entry.treatmentName ? ` · ${entry.treatmentName}` : ""}
              </p>
              <p className="text-sm">Trial {trial.code}</p>
            </div>
          ))}
        </div>
      )}
    </>
  );
}

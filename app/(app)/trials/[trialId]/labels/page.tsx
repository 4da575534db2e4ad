import type { Metadata } from "next";
import { trialOrNotFound } from "../../_components/trial-or-not-found";
import { Notice } from "@/components/ui/notice";
import { PageHeader } from "@/components/ui/page-header";
import { requirePage } from "@/lib/auth/guard";
import { listOwnAssignments } from "@/lib/data/trials";
import { appUrl } from "@/lib/app-url";
import { labelsFor } from "@/lib/trials/labels";
import { LabelSheet } from "../../_components/label-sheet";
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
        lead="Print on plain paper or label stock, cut along the lines, and tape each label onto its bag. Scanning a label's code with a phone opens the harvest form for that block."
      >
        {list.length ? <PrintButton /> : null}
      </PageHeader>
      {list.length === 0 ? (
        <Notice>Your farm has no list for this trial yet. Accept the invitation on the trial page first.</Notice>
      ) : (
        <LabelSheet labels={await labelsFor(list, appUrl())} trialCode={trial.code} />
      )}
    </>
  );
}

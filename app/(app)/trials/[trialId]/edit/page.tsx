import type { Metadata } from "next";
import { trialOrNotFound } from "../../_components/trial-or-not-found";
import { redirect } from "next/navigation";
import { PageHeader } from "@/components/ui/page-header";
import { requirePage } from "@/lib/auth/guard";
import { DesignPage } from "../../_components/design-page";

export const metadata: Metadata = { title: "Edit trial design" };

const text = (value: number | null, scale = 1) => (value === null ? "" : String(Math.round(value * scale * 100) / 100));

export default async function EditTrialPage({ params }: { params: Promise<{ trialId: string }> }) {
  const member = await requirePage("trial:manage");
  const { trialId } = await params;
  const trial = await trialOrNotFound(member, trialId);
  if (trial.status !== "draft") redirect(`/trials/${trialId}`);
  return (
    <>
      <PageHeader title={`Edit ${trial.code}`} lead="The design can change until enrolment opens." />
      <DesignPage
        member={member}
        initial={{
          trialId,
          title: trial.title,
          question: trial.question,
          speciesId: trial.speciesId,
          designKind: trial.designKind,
          arms: trial.arms.map((arm) => ({
            label: arm.label,
            strainId: arm.strainId,
            treatmentId: arm.treatmentId ?? "",
            isReference: arm.isReference,
          })),
          outcomeFlushes: trial.outcomeFlushes,
          contaminatedHandling: trial.contaminatedHandling,
          protocolNotes: trial.protocolNotes,
          enrolmentDeadline: trial.enrolmentDeadline ?? "",
          inoculationFrom: trial.inoculationFrom ?? "",
          inoculationTo: trial.inoculationTo ?? "",
          fruitingFrom: trial.fruitingFrom ?? "",
          fruitingTo: trial.fruitingTo ?? "",
          dataDue: trial.dataDue ?? "",
          smallestDifference: text(trial.smallestDifference),
          expectedSd: text(trial.expectedSd),
          plannedFarms: text(trial.plannedFarms),
          expectedLossPercent: text(trial.expectedLoss, 100),
          blocksPerRoom: trial.blocksPerRoom === null ? "" : String(trial.blocksPerRoom),
          roomIcc: trial.roomIcc === null ? "" : String(trial.roomIcc),
        }}
      />
    </>
  );
}

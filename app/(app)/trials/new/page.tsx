import type { Metadata } from "next";
import { PageHeader } from "@/components/ui/page-header";
import { requirePage } from "@/lib/auth/guard";
import { DesignPage } from "../_components/design-page";

export const metadata: Metadata = { title: "Design a trial" };

export default async function NewTrialPage() {
  const member = await requirePage("trial:manage");
  return (
    <>
      <PageHeader title="Design a trial" lead="Saved as a draft; farms see it only once you open it for enrolment." />
      <DesignPage
        member={member}
        initial={{
          title: "",
          question: "",
          speciesId: "",
          designKind: "one_factor",
          arms: [
            { label: "A", strainId: "", treatmentId: "", isReference: true },
            { label: "B", strainId: "", treatmentId: "", isReference: false },
          ],
          outcomeFlushes: 2,
          contaminatedHandling: "exclude",
          protocolNotes: "",
          enrolmentDeadline: "",
          inoculationFrom: "",
          inoculationTo: "",
          fruitingFrom: "",
          fruitingTo: "",
          dataDue: "",
          smallestDifference: "10",
          expectedSd: "",
          plannedFarms: "4",
          expectedLossPercent: "5",
          blocksPerRoom: "6",
          roomIcc: "",
        }}
      />
    </>
  );
}

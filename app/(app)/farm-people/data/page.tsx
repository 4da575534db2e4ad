import type { Metadata } from "next";
import { ButtonLink } from "@/components/ui/button";
import { Card } from "@/components/ui/card";
import { Notice } from "@/components/ui/notice";
import { PageHeader } from "@/components/ui/page-header";
import { requirePage } from "@/lib/auth/guard";
import { exportFiles } from "@/lib/members/farm-export";
import { ActionForm } from "@/components/forms/action-form";
import { withdrawFarmDataAction } from "./actions";

export const metadata: Metadata = { title: "Your farm's data" };

export default async function FarmDataPage() {
  const member = await requirePage("farm-data:export");
  return (
    <>
      <PageHeader
        title="Your farm's data"
        lead={`Everything ${member.farmName} gave the co-op is yours: download it at any time, or withdraw it.`}
      />
      <div className="grid grid-cols-1 gap-6 lg:grid-cols-2">
        <Card title="Download everything">
          <p className="mb-3 text-sm">
            One zip file with your blocks, harvests, corrections and activity as spreadsheets (CSV), every season-log file you uploaded
            exactly as sent, and a README that explains every column.
          </p>
          <ul className="mb-4 list-inside list-disc text-sm text-ink-soft">
            {Object.values(exportFiles).map((spec) => (
              <li key={spec.file}>
                {spec.file}: {spec.about}
              </li>
            ))}
          </ul>
          <ButtonLink href="/farm-people/data/download" prefetch={false}>
            Download the zip
          </ButtonLink>
        </Card>
        <Card title="Withdraw your farm's data">
          <div className="space-y-3 text-sm">
            <Notice tone="danger" title="This cannot be undone">
              <p>
                All of your farm&apos;s blocks, harvests, uploaded files and corrections are deleted, and your farm leaves any trial it is
                enrolled in.
              </p>
              <p>The co-op&apos;s pooled results are recomputed without your farm.</p>
              <p>
                Trial reports already published keep their published figures; they will carry a note that a farm withdrew after publication.
                Your farm&apos;s people can still sign in, and the record that you withdrew stays in the activity log.
              </p>
            </Notice>
            <p>Download your data first if you may want it later.</p>
            <ActionForm
              action={withdrawFarmDataAction}
              testId="withdraw"
              submitLabel="Withdraw and delete our data"
              pendingLabel="Deleting…"
              variant="danger"
              fields={[{ name: "confirmation", label: `Type “${member.farmName}” to confirm`, autoComplete: "off" }]}
            />
          </div>
        </Card>
      </div>
    </>
  );
}

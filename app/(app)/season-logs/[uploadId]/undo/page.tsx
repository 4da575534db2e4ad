import type { Metadata } from "next";
import { notFound } from "next/navigation";
import { ButtonLink } from "@/components/ui/button";
import { Card } from "@/components/ui/card";
import { PageHeader } from "@/components/ui/page-header";
import { requirePage } from "@/lib/auth/guard";
import { getUploadView, type UploadView } from "@/lib/data/season-logs";
import { isAppError } from "@/lib/errors";
import { formatDateTime, formatDay } from "@/lib/time/display";
import { timeDisplayFor } from "@/lib/time/member-display";
import { UndoCommitForm } from "./undo-form";
import { count } from "@/lib/words";

export const metadata: Metadata = { title: "Undo a commit" };

export default async function UndoCommitPage({ params }: { params: Promise<{ uploadId: string }> }) {
  const member = await requirePage("farm-data:correct");
  const { uploadId } = await params;
  let view: UploadView;
  try {
    view = await getUploadView(member, uploadId);
  } catch (error) {
    if (isAppError(error) && error.code === "not_found") notFound();
    throw error;
  }
  const { upload } = view;
  const display = await timeDisplayFor(member);
  const counts = view.report.preview.counts;
  return (
    <>
      <PageHeader title={`Undo the commit of ${upload.fileName}`}>
        <ButtonLink href="/season-logs" variant="secondary">
          Season logs
        </ButtonLink>
      </PageHeader>
      <Card>
        {upload.outcome !== "committed" ? (
          <p>This upload was not committed, so there is nothing to undo.</p>
        ) : upload.undoneAt ? (
          <p>This commit was undone on {formatDay(upload.undoneAt, display)}.</p>
        ) : (
          <div className="space-y-4">
            <p>
              Committed on {upload.committedAt ? formatDateTime(upload.committedAt, display) : ""}. Undoing it removes the{" "}
              {count(counts.newBlocks, "new block")} and {count(counts.newHarvests, "new harvest")} it added and puts back the{" "}
              {count(counts.changedBlocks + counts.changedHarvests, "block or harvest", "blocks and harvests")} it changed, exactly as they
              were. Each value put back is kept in the blocks&apos; history with your reason; nothing is deleted silently.
            </p>
            <p>
              If a later file or a correction has changed the same rows since, nothing is undone and you are told which rows: undo the later
              change first, or correct those values on the blocks&apos; pages.
            </p>
            <UndoCommitForm uploadId={upload.id} />
          </div>
        )}
      </Card>
    </>
  );
}

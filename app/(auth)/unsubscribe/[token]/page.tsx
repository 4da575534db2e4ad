import type { Metadata } from "next";
import Link from "next/link";
import { getReminderChoice } from "@/lib/data/trials";
import { PublicCard } from "../../_components/public-card";
import { ReminderChoice } from "./_components/reminder-choice";

export const metadata: Metadata = { title: "Trial reminders" };

/**
 * Public: the link in a trial e-mail opens this page, which only reads. Stopping the farm's
 * reminders takes a click (a mail scanner that opens the link changes nothing), and can be undone.
 */
export default async function UnsubscribePage({ params }: { params: Promise<{ token: string }> }) {
  const token = decodeURIComponent((await params).token);
  const choice = await getReminderChoice(token);
  return (
    <PublicCard
      footer={
        <Link href="/sign-in" className="inline-flex min-h-11 items-center text-base font-semibold text-moss-700 underline">
          Sign in to Rhizomorph
        </Link>
      }
    >
      {choice ? (
        <ReminderChoice token={token} trialCode={choice.trialCode} remindersAllowed={choice.remindersAllowed} />
      ) : (
        <>
          <h1 className="text-2xl font-semibold text-moss-800">This link does not work</h1>
          <p className="mt-4 text-base text-ink">
            The link is incomplete or was not made by Rhizomorph. Copy the whole link from the e-mail, or ask the coordinator to stop the
            reminders for you.
          </p>
        </>
      )}
    </PublicCard>
  );
}

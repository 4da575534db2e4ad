import type { Metadata } from "next";
import Link from "next/link";
import { optOutOfReminders } from "@/lib/data/trials";

export const metadata: Metadata = { title: "Trial reminders" };

/** Public: the link in a trial e-mail turns off reminders for that farm and trial. */
export default async function UnsubscribePage({ params }: { params: Promise<{ token: string }> }) {
  const { token } = await params;
  const trialCode = await optOutOfReminders(decodeURIComponent(token));
  return (
    <main id="main" className="mx-auto max-w-xl px-4 py-16">
      <h1 className="text-2xl font-semibold text-moss-800">{trialCode ? "Reminders stopped" : "This link does not work"}</h1>
      <p className="mt-4 text-base text-ink">
        {trialCode
          ? `Your farm will get no more reminder e-mails about trial ${trialCode}. Invitations, your enrolment confirmation and published results still arrive.`
          : "The link is incomplete or was not made by Rhizomorph. Copy the whole link from the e-mail, or ask the coordinator to stop the reminders for you."}
      </p>
      <p className="mt-6">
        <Link href="/sign-in" className="inline-flex min-h-11 items-center font-semibold text-moss-700 underline">
          Sign in to Rhizomorph
        </Link>
      </p>
    </main>
  );
}

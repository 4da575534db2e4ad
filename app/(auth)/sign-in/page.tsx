import type { Metadata } from "next";
import { redirect } from "next/navigation";
import { currentMember } from "@/lib/auth/guard";
import { PublicCard } from "../_components/public-card";
import { SignInForm } from "./_components/sign-in-form";

export const metadata: Metadata = { title: "Sign in" };

const signedOutNotes: Record<string, string> = {
  "1": "You are signed out.",
  everywhere: "You are signed out on every device and browser.",
  password: "Your password is changed and you are signed out everywhere. Sign in with the new password.",
};

export default async function SignInPage({ searchParams }: { searchParams: Promise<Record<string, string | undefined>> }) {
  if (await currentMember()) redirect("/");
  const params = await searchParams;
  return (
    <>
      <p className="mt-2 text-ink-soft">
        The co-op&apos;s shared season records and strain trials. Your farm&apos;s own rows are seen by your farm alone.
      </p>
      <PublicCard
        title="Sign in"
        footer={
          <>
            Forgotten your password?{" "}
            <a className="underline" href="/reset-password">
              Reset it by e-mail
            </a>
            .
          </>
        }
      >
        {params.signedOut ? (
          <p role="status" className="mb-4 rounded-lg bg-moss-50 px-3 py-2 text-sm text-moss-800">
            {signedOutNotes[params.signedOut] ?? signedOutNotes["1"]}
          </p>
        ) : null}
        <SignInForm returnTo={params.callbackUrl} />
      </PublicCard>
    </>
  );
}

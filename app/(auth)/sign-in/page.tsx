import type { Metadata } from "next";
import { redirect } from "next/navigation";
import { currentMember } from "@/lib/auth/guard";
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
    <main className="flex min-h-screen items-center justify-center px-4 py-10">
      <div className="w-full max-w-md">
        <p className="text-3xl font-semibold tracking-tight text-moss-800">Rhizomorph</p>
        <p className="mt-2 text-ink-soft">
          The co-op&apos;s shared season records and strain trials. Your farm&apos;s own rows are seen by your farm alone.
        </p>
        <div className="mt-8 rounded-xl border border-oat-300 bg-white p-6 shadow-sm">
          <h1 className="mb-4 text-xl font-semibold">Sign in</h1>
          {params.signedOut ? (
            <p role="status" className="mb-4 rounded-lg bg-moss-50 px-3 py-2 text-sm text-moss-800">
              {signedOutNotes[params.signedOut] ?? signedOutNotes["1"]}
            </p>
          ) : null}
          <SignInForm returnTo={params.callbackUrl} />
        </div>
        <p className="mt-6 text-sm text-ink-soft">
          Forgotten your password?{" "}
          <a className="underline" href="/reset-password">
            Reset it by e-mail
          </a>
          .
        </p>
      </div>
    </main>
  );
}

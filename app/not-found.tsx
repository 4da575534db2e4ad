import type { Metadata } from "next";
import Link from "next/link";
import { currentMember } from "@/lib/auth/guard";
import { SignedInShell } from "./(app)/_components/signed-in-shell";
import SignedInNotFound from "./(app)/not-found";

export const metadata: Metadata = { title: "Page not found" };

/** Any address the app does not have. A signed-in member keeps the menu; anyone else gets a way to the start page. */
export default async function NotFound() {
  const member = await currentMember();
  if (member)
    return (
      <SignedInShell member={member}>
        <SignedInNotFound />
      </SignedInShell>
    );
  return (
    <main id="main" className="flex min-h-screen items-center justify-center px-4">
      <div className="max-w-md rounded-xl border border-oat-300 bg-white p-6 shadow-sm">
        <p className="text-sm font-semibold tracking-tight text-moss-800">Rhizomorph</p>
        <h1 className="mt-2 text-xl font-semibold text-moss-800">There is no page at this address</h1>
        <p className="mt-3 text-ink-soft">The link may be mistyped, or the page may have moved.</p>
        <Link href="/" className="mt-5 inline-flex min-h-11 items-center rounded-lg bg-moss-600 px-4 font-semibold text-white">
          Go to the start page
        </Link>
      </div>
    </main>
  );
}

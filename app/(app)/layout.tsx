import { redirect } from "next/navigation";
import { currentMember } from "@/lib/auth/guard";
import { ServiceWorker } from "@/components/offline/service-worker";
import { SignedInShell } from "./_components/signed-in-shell";

export default async function SignedInLayout({ children }: { children: React.ReactNode }) {
  const member = await currentMember();
  if (!member) redirect("/sign-in");
  return (
    <SignedInShell member={member}>
      {children}
      <ServiceWorker />
    </SignedInShell>
  );
}

import { redirect } from "next/navigation";
import { QueryProvider } from "@/components/query-provider";
import { currentMember } from "@/lib/auth/guard";
import { roleLabels } from "@/lib/auth/permissions";
import { navigationFor } from "@/lib/navigation";
import { ServiceWorker } from "@/components/offline/service-worker";
import { AppNavigation } from "./_components/app-navigation";

export default async function SignedInLayout({ children }: { children: React.ReactNode }) {
  const member = await currentMember();
  if (!member) redirect("/sign-in");
  const items = navigationFor(member.role).map(({ href, label }) => ({ href, label }));
  return (
    <div className="min-h-screen lg:flex">
      <AppNavigation items={items} memberName={member.name} roleLabel={roleLabels[member.role]} farmName={member.farmName} />
      <main id="main" className="mx-auto w-full max-w-6xl flex-1 px-4 py-6 sm:px-8 sm:py-10">
        <QueryProvider>{children}</QueryProvider>
      </main>
      <ServiceWorker />
    </div>
  );
}

import { QueryProvider } from "@/components/query-provider";
import type { Member } from "@/lib/data/members";
import { roleLabels } from "@/lib/auth/permissions";
import { navigationFor } from "@/lib/navigation";
import { AppNavigation } from "./app-navigation";

/** The signed-in frame: the skip link, the member's menu and the page. Also around the app-wide not-found page. */
export function SignedInShell({ member, children }: { member: Member; children: React.ReactNode }) {
  const items = navigationFor(member.role).map(({ href, label }) => ({ href, label }));
  return (
    <div className="min-h-screen lg:flex">
      {/* The first thing a keyboard reaches: past the menu, straight to the page. */}
      <a
        href="#main"
        className="sr-only focus:not-sr-only focus:fixed focus:left-3 focus:top-3 focus:z-50 focus:rounded-lg focus:bg-white focus:px-4 focus:py-2 focus:font-semibold focus:text-moss-800 focus:shadow"
      >
        Skip to the page
      </a>
      <AppNavigation items={items} memberName={member.name} roleLabel={roleLabels[member.role]} farmName={member.farmName} />
      {/* min-w-0: beside the menu, a wide table scrolls in its frame instead of widening the page. */}
      <main id="main" className="mx-auto w-full min-w-0 max-w-6xl flex-1 px-4 py-6 sm:px-8 sm:py-10">
        <QueryProvider>{children}</QueryProvider>
      </main>
    </div>
  );
}

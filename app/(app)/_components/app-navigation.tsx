"use client";

import { signOut } from "next-auth/react";
import Link from "next/link";
import { usePathname } from "next/navigation";
import { useState } from "react";
import { forgetKeptPages } from "@/components/offline/service-worker";

interface Props {
  items: { href: string; label: string }[];
  memberName: string;
  roleLabel: string;
  farmName: string | null;
}

export function AppNavigation({ items, memberName, roleLabel, farmName }: Props) {
  const pathname = usePathname();
  const [open, setOpen] = useState(false);
  return (
    <aside className="no-print border-b border-moss-800 bg-moss-800 text-oat-50 lg:sticky lg:top-0 lg:h-screen lg:w-64 lg:shrink-0 lg:border-b-0">
      <div className="flex items-center justify-between px-4 py-3 lg:block lg:px-5 lg:py-6">
        <Link href="/" className="text-xl font-semibold tracking-tight">
          Rhizomorph
        </Link>
        <button
          type="button"
          className="min-h-11 rounded-lg border border-oat-50/40 px-3 text-sm lg:hidden"
          aria-expanded={open}
          aria-controls="app-menu"
          onClick={() => setOpen((value) => !value)}
        >
          Menu
        </button>
      </div>
      <nav id="app-menu" aria-label="Main" className={`${open ? "block" : "hidden"} px-2 pb-4 lg:block`}>
        <ul className="space-y-1">
          {items.map((item) => {
            const current = pathname === item.href || pathname.startsWith(`${item.href}/`);
            return (
              <li key={item.href}>
                <Link
                  href={item.href}
                  aria-current={current ? "page" : undefined}
                  onClick={() => setOpen(false)}
                  className={`flex min-h-11 items-center rounded-lg px-3 text-base ${
                    current ? "bg-oat-50 font-semibold text-moss-800" : "text-oat-50 hover:bg-moss-700"
                  }`}
                >
                  {item.label}
                </Link>
              </li>
            );
          })}
        </ul>
        <div className="mt-6 border-t border-oat-50/20 px-3 pt-4 text-sm">
          <p className="font-semibold" data-testid="member-name">
            {memberName}
          </p>
          <p className="text-oat-200" data-testid="member-role">
            {roleLabel}
            {farmName ? ` · ${farmName}` : ""}
          </p>
          <Link href="/cautions" className="mt-3 block text-oat-200 underline">
            Safety cautions
          </Link>
          <Link href="/glossary" className="mt-1 block text-oat-200 underline">
            Words used in the results
          </Link>
          {/* Through Auth.js's own endpoint, where the proxy cannot renew the cookie being cleared;
              then a relative redirect, because Auth.js would name the host "localhost"; a full page
              load, so nothing the signed-out member's pages held stays in memory. */}
          <button
            type="button"
            onClick={() =>
              void forgetKeptPages()
                .then(() => signOut({ redirect: false }))
                // eslint-disable-next-line @next/next/no-location-assign-relative-destination -- the full page load above
                .then(() => window.location.assign("/sign-in?signedOut=1"))
            }
            className="mt-3 min-h-11 rounded-lg border border-oat-50/40 px-3 hover:bg-moss-700"
          >
            Sign out
          </button>
        </div>
      </nav>
    </aside>
  );
}

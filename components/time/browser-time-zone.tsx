"use client";

import { useRouter } from "next/navigation";
import { useEffect } from "react";
import { browserZoneCookie } from "@/lib/time/browser-zone";

/** Tells the server this browser's time zone (lib/time/browser-zone.ts), and redraws the page once if it was not yet known. */
export function BrowserTimeZone() {
  const router = useRouter();
  useEffect(() => {
    const zone = Intl.DateTimeFormat().resolvedOptions().timeZone;
    const sent = document.cookie
      .split("; ")
      .find((cookie) => cookie.startsWith(`${browserZoneCookie}=`))
      ?.slice(browserZoneCookie.length + 1);
    if (!zone || sent === encodeURIComponent(zone)) return;
    document.cookie = `${browserZoneCookie}=${encodeURIComponent(zone)}; path=/; max-age=31536000; samesite=lax`;
    // Without the cookie the server wrote UTC; only another zone needs the page drawn again.
    if (sent !== undefined || (zone !== "UTC" && zone !== "Etc/UTC")) router.refresh();
  }, [router]);
  return null;
}

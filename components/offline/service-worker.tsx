"use client";

import { useEffect } from "react";

/**
 * Installs the offline worker (app/sw.ts, built to /sw.js by `npm run build`), so the app can be
 * added to a phone's home screen and the harvest form opens without a signal. Not in `next dev`,
 * which builds no worker.
 */
export function ServiceWorker() {
  useEffect(() => {
    if (process.env.NODE_ENV !== "production" || !("serviceWorker" in navigator)) return;
    navigator.serviceWorker.register("/sw.js", { scope: "/" }).catch(() => {
      // Without the worker the app works as before, only not offline.
    });
  }, []);
  return null;
}

/** Asks the worker to keep this page now (its first visit happened before the worker was there to keep it). */
export function keepThisPageOffline(): void {
  if (process.env.NODE_ENV !== "production" || !("serviceWorker" in navigator)) return;
  void navigator.serviceWorker.ready.then((registration) =>
    registration.active?.postMessage({ type: "CACHE_URLS", payload: { urlsToCache: [window.location.href] } }),
  );
}

/** On signing out: the kept harvest form (this member's blocks) is not for whoever uses the phone next. Their unsent entries stay, for them. */
export async function forgetKeptPages(): Promise<void> {
  if (!("caches" in window)) return;
  try {
    const names = await caches.keys();
    await Promise.all(names.filter((name) => name.startsWith("harvest-page-v")).map((name) => caches.delete(name)));
  } catch {
    // Signing out goes on whatever the cache says.
  }
}

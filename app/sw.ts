/// <reference lib="webworker" />
import type { PrecacheEntry, SerwistGlobalConfig } from "serwist";
import { ExpirationPlugin, NetworkFirst, Serwist } from "serwist";

// Filled in by `serwist build` with the build's static files (scripts, styles, fonts, icons).
declare global {
  interface WorkerGlobalScope extends SerwistGlobalConfig {
    __SW_MANIFEST: (PrecacheEntry | string)[] | undefined;
  }
}
declare const self: ServiceWorkerGlobalScope;

/** Raise to drop every page this worker kept, e.g. when a kept page could no longer run with the new build. */
const pagesVersion = 2;

const serwist = new Serwist({
  precacheEntries: self.__SW_MANIFEST,
  skipWaiting: true,
  clientsClaim: true,
  runtimeCaching: [
    {
      // The phone harvest form only: it must open in a grow room without a signal. Every other page
      // (and every API answer) goes to the network as if there were no worker.
      matcher: ({ url, request, sameOrigin }) =>
        sameOrigin && request.method === "GET" && url.pathname === "/blocks/harvest" && !request.headers.has("RSC"),
      handler: new NetworkFirst({
        cacheName: `harvest-page-v${pagesVersion}`,
        // Poor Wi-Fi: after 4 s the kept copy opens instead.
        networkTimeoutSeconds: 4,
        matchOptions: { ignoreSearch: true },
        plugins: [
          // Never keep the sign-in page that a signed-out visit is sent to, nor an error page.
          { cacheWillUpdate: ({ response }) => Promise.resolve(response.ok && !response.redirected ? response : null) },
          new ExpirationPlugin({ maxEntries: 4 }),
        ],
      }),
    },
  ],
});

// Old versions' kept pages go once this worker takes over.
self.addEventListener("activate", (event) => {
  event.waitUntil(
    caches
      .keys()
      .then((names) =>
        Promise.all(
          names
            .filter((name) => name.startsWith("harvest-page-v") && name !== `harvest-page-v${pagesVersion}`)
            .map((name) => caches.delete(name)),
        ),
      ),
  );
});

serwist.addEventListeners();

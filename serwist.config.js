// @ts-check
// Builds public/sw.js after `next build` (Serwist's configurator mode: `next build` uses Turbopack,
// which the webpack plugin of @serwist/next cannot join). The manifest lists the build's static
// files; pages are per request and per member, so none is precached (see DEVELOPERS.md, "Offline").
import { serwist } from "@serwist/next/config";

export default await serwist({
  swSrc: "app/sw.ts",
  swDest: "public/sw.js",
  precachePrerendered: false,
  // The public folder holds robots.txt and the icons; the service worker itself is left out by Serwist.
  globIgnores: ["public/robots.txt"],
});

import type { MetadataRoute } from "next";

/** What a phone needs to install the app on its home screen; it opens on the harvest form, the page used in the grow room. */
export default function manifest(): MetadataRoute.Manifest {
  return {
    name: "Rhizomorph",
    short_name: "Rhizomorph",
    description: "Harvest records and strain trials for a mushroom growers' cooperative",
    id: "/",
    start_url: "/blocks/harvest",
    scope: "/",
    display: "standalone",
    background_color: "#f6f4ee",
    theme_color: "#2e5e4e",
    icons: [
      { src: "/icons/icon-192.png", sizes: "192x192", type: "image/png", purpose: "any" },
      { src: "/icons/icon-512.png", sizes: "512x512", type: "image/png", purpose: "any" },
      { src: "/icons/maskable-512.png", sizes: "512x512", type: "image/png", purpose: "maskable" },
      { src: "/icon.svg", sizes: "any", type: "image/svg+xml" },
    ],
  };
}

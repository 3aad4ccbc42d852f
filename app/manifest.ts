import type { MetadataRoute } from "next";

/** Makes Seedplot installable on a phone: it opens on the list of sites to record. Icons: scripts/make-icons.ts. */
export default function manifest(): MetadataRoute.Manifest {
  return {
    name: "Seedplot",
    short_name: "Seedplot",
    description: "Record on-farm trial observations plot by plot, with or without a signal.",
    id: "/portal/record",
    start_url: "/portal/record",
    scope: "/",
    display: "standalone",
    background_color: "#fbf9f4",
    theme_color: "#1b5c2e",
    icons: [
      { src: "/icons/icon-192.png", sizes: "192x192", type: "image/png", purpose: "any" },
      { src: "/icons/icon-512.png", sizes: "512x512", type: "image/png", purpose: "any" },
      { src: "/icons/maskable-512.png", sizes: "512x512", type: "image/png", purpose: "maskable" },
    ],
  };
}

import type { MetadataRoute } from "next";
import { OFFLINE_WORDS } from "@/lib/domain/vocabulary/offline-words";

/** Makes Seedplot installable on a phone: it opens on the list of sites to record. Icons: scripts/make-icons.ts. */
export default function manifest(): MetadataRoute.Manifest {
  return {
    name: OFFLINE_WORDS.appName,
    short_name: OFFLINE_WORDS.appName,
    description: OFFLINE_WORDS.appDescription,
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

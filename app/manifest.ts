import type { MetadataRoute } from "next";

/** Web app manifest: name and our compass-rose icons (public/), so an installed or pinned tab shows the mark. */
export default function manifest(): MetadataRoute.Manifest {
  return {
    name: "Portolan",
    short_name: "Portolan",
    description: "Integration checks for RF front ends built from N-port parts.",
    start_url: "/",
    display: "standalone",
    background_color: "#F4EFE2",
    theme_color: "#F4EFE2",
    icons: [
      { src: "/icon.svg", sizes: "any", type: "image/svg+xml" },
      { src: "/icon-192.png", sizes: "192x192", type: "image/png" },
      { src: "/icon-512.png", sizes: "512x512", type: "image/png" },
    ],
  };
}

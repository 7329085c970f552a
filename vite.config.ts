import tailwindcss from "@tailwindcss/vite";
import react from "@vitejs/plugin-react";
import { defineConfig } from "vite";

// The Express server (PORT, default 8080) serves /api, the SSE stream and /healthz; in
// development Vite serves the client and forwards those paths to it.
const API_TARGET = "http://127.0.0.1:8080";

export default defineConfig({
  plugins: [react(), tailwindcss()],
  server: {
    proxy: {
      "/api": { target: API_TARGET, changeOrigin: false },
      "/healthz": { target: API_TARGET },
    },
  },
  preview: {
    proxy: {
      "/api": { target: API_TARGET },
      "/healthz": { target: API_TARGET },
    },
  },
  build: {
    outDir: "dist",
    emptyOutDir: true,
    sourcemap: true,
    // dist/.vite/manifest.json: which chunks and styles each entry and lazy route loads
    // (npm run bench reads it for the first-load and lazy-chunk sizes).
    manifest: true,
  },
});

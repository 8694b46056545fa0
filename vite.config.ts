// One config for the whole workspace: the web app's build and dev server, and the
// Vitest projects of every package (`pnpm test` runs them all).
import { fileURLToPath } from "node:url";
import react from "@vitejs/plugin-react";
import tailwindcss from "@tailwindcss/vite";
import { defineConfig } from "vitest/config";

const repoRoot = fileURLToPath(new URL(".", import.meta.url));
const apiPort = process.env.PORT ?? "3000";

export default defineConfig({
  root: "apps/web",
  plugins: [react(), tailwindcss()],
  build: { outDir: "dist", emptyOutDir: true, chunkSizeWarningLimit: 1500 },
  worker: { format: "es" },
  server: { proxy: { "/api": `http://localhost:${apiPort}` } },
  preview: { proxy: { "/api": `http://localhost:${apiPort}` } },
  test: {
    root: repoRoot,
    projects: [
      { extends: true, test: { name: "stats", root: repoRoot, include: ["packages/stats/{src,test}/**/*.test.ts"], environment: "node", testTimeout: 120_000 } },
      { extends: true, test: { name: "contracts", root: repoRoot, include: ["packages/contracts/src/**/*.test.ts"], environment: "node" } },
      { extends: true, test: { name: "intake", root: repoRoot, include: ["packages/intake/src/**/*.test.ts"], environment: "node" } },
      { extends: true, test: { name: "api", root: repoRoot, include: ["apps/api/src/**/*.test.ts"], environment: "node", testTimeout: 60_000, hookTimeout: 60_000 } },
      { extends: true, test: { name: "cli", root: repoRoot, include: ["apps/cli/src/**/*.test.ts"], environment: "node", testTimeout: 300_000 } },
      { extends: true, test: { name: "web", root: repoRoot, include: ["apps/web/src/**/*.test.{ts,tsx}"], environment: "happy-dom" } },
      { extends: true, test: { name: "e2e", root: repoRoot, include: ["tests/e2e/**/*.test.ts"], globalSetup: ["tests/e2e/support/global-setup.ts"], environment: "node", testTimeout: 300_000, hookTimeout: 300_000, fileParallelism: false } },
    ],
  },
});

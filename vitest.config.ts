import { defineConfig } from "vitest/config";
import { cloudflareTest } from "@cloudflare/vitest-pool-workers";

// Numeric and design tests in plain Node (fast, many cases), the HTTP surface
// inside the Workers runtime against miniflare's real KV, and the form pages in a browser.
export default defineConfig({
  test: {
    projects: [
      {
        test: { name: "unit", include: ["test/unit/**/*.test.ts"], environment: "node" },
      },
      {
        plugins: [cloudflareTest({ wrangler: { configPath: "./wrangler.toml" } })],
        test: { name: "worker", include: ["test/integration/**/*.test.ts"] },
      },
      {
        // The form pages in Debian's headless Chromium against `wrangler dev` (started by the setup).
        test: {
          name: "browser",
          include: ["test/browser/**/*.test.ts"],
          environment: "node",
          globalSetup: ["test/browser/globalSetup.ts"],
          testTimeout: 60000,
          hookTimeout: 90000,
          fileParallelism: false,
        },
      },
    ],
  },
});

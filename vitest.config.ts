import { defineConfig } from "vitest/config";
import { cloudflareTest } from "@cloudflare/vitest-pool-workers";

// Two projects: numeric and design tests in plain Node (fast, many cases), and
// the HTTP surface inside the Workers runtime against miniflare's real KV.
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
    ],
  },
});

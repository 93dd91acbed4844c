/// <reference types="vitest/config" />
import path from "node:path";
import { defineConfig } from "vite";

// The multi-process proof: production processes of the built app (`npm run build` first) on one
// database behind a loopback balancer. One file at a time: each starts its own processes.
export default defineConfig({
  root: path.resolve(import.meta.dirname, "../.."),
  resolve: { tsconfigPaths: true },
  test: {
    include: ["tests/multi-process/**/*.test.ts"],
    environment: "node",
    pool: "forks",
    fileParallelism: false,
    testTimeout: 90_000,
    hookTimeout: 180_000,
  },
});

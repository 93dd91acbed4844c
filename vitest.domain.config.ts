/// <reference types="vitest/config" />
import { defineConfig } from "vite";

// The estimating engine's tests alone: what `npm run mutate` runs against every mutant. The domain
// is pure TypeScript, so no React Router plugin, database or setup file is needed.
export default defineConfig({
  resolve: { tsconfigPaths: true },
  test: {
    include: ["tests/unit/domain/**/*.test.ts"],
    environment: "node",
    pool: "forks",
    testTimeout: 20_000,
  },
});

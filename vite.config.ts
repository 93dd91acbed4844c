/// <reference types="vitest/config" />
import { reactRouter } from "@react-router/dev/vite";
import tailwindcss from "@tailwindcss/vite";
import { defineConfig } from "vite";

export default defineConfig({
  // The React Router plugin cannot run inside Vitest (it expects its HMR preamble).
  plugins: [tailwindcss(), !process.env.VITEST && reactRouter()],
  resolve: { tsconfigPaths: true },
  // The 3D preview's chunk (three.js) is large by nature; it loads lazily, after hydration.
  build: { chunkSizeWarningLimit: 1100 },
  optimizeDeps: { include: ["three", "@react-three/fiber", "@react-three/drei"] },
  test: {
    include: ["tests/unit/**/*.test.{ts,tsx}"],
    environment: "node",
    setupFiles: ["tests/unit/support/setup-env.ts"],
    pool: "forks",
    testTimeout: 20_000,
    hookTimeout: 30_000,
  },
});

// Loaded into the soak's server with `node --expose-gc --import ./tests/bench/support/gc-probe.mjs
// server.mjs`: on SIGUSR2 it collects garbage (twice, so objects freed by finalizers go too) and
// appends one JSON line of process.memoryUsage() to BENCH_GC_FILE. The app itself is unchanged.
import { appendFileSync } from "node:fs";

const file = process.env.BENCH_GC_FILE;
if (file && typeof globalThis.gc === "function") {
  process.on("SIGUSR2", () => {
    globalThis.gc();
    globalThis.gc();
    const { rss, heapUsed, heapTotal, external, arrayBuffers } = process.memoryUsage();
    appendFileSync(file, `${JSON.stringify({ at: Date.now(), rss, heapUsed, heapTotal, external, arrayBuffers })}\n`);
  });
}

/*
 * HTTP load with autocannon against the bench server on loopback: fixed connections and duration,
 * so every run stops by itself. Redirects count as successes (a form post answers 302). Latencies
 * are collected per response, so loads cut into slices still give exact percentiles.
 */
import autocannon, { type AutocannonOptions } from "autocannon";

export type LoadResult = {
  rps: number;
  p50Ms: number;
  p99Ms: number;
  /** 2xx and 3xx answers. */
  ok: number;
  /** Connection errors, timeouts, 1xx, 4xx and 5xx answers. */
  failed: number;
  statusCounts: Record<string, number>;
  durationS: number;
};

/** What to load; `connections` defaults to CONNECTIONS. */
export type Target = Omit<AutocannonOptions, "duration">;

export const CONNECTIONS = 10;

type Tally = {
  latenciesMs: number[];
  ok: number;
  failed: number;
  statusCounts: Record<string, number>;
  durationS: number;
};

const emptyTally = (): Tally => ({ latenciesMs: [], ok: 0, failed: 0, statusCounts: {}, durationS: 0 });

async function runSlice(target: Target, seconds: number, tally: Tally | null): Promise<void> {
  const instance = autocannon({ connections: CONNECTIONS, ...target, duration: seconds, timeout: 10 });
  if (tally) {
    instance.on("response", (_client: unknown, statusCode: number, _bytes: number, responseTimeMs: number) => {
      tally.latenciesMs.push(responseTimeMs);
      tally.statusCounts[statusCode] = (tally.statusCounts[statusCode] ?? 0) + 1;
      if (statusCode >= 200 && statusCode < 400) tally.ok += 1;
      else tally.failed += 1;
    });
  }
  const result = await instance;
  if (tally) {
    tally.failed += result.errors;
    tally.durationS += result.duration;
  }
}

function summarise(tally: Tally): LoadResult {
  const sorted = tally.latenciesMs.sort((a, b) => a - b);
  const at = (p: number) =>
    sorted.length ? sorted[Math.min(sorted.length - 1, Math.floor(p * sorted.length))]! : Number.NaN;
  return {
    rps: tally.ok / tally.durationS,
    p50Ms: at(0.5),
    p99Ms: at(0.99),
    ok: tally.ok,
    failed: tally.failed,
    statusCounts: tally.statusCounts,
    durationS: tally.durationS,
  };
}

/** One load for `seconds` (after an unrecorded warm-up of `warmupS`). */
export async function loadTest(target: Target, seconds: number, warmupS = 1): Promise<LoadResult> {
  if (warmupS > 0) await runSlice(target, warmupS, null);
  const tally = emptyTally();
  await runSlice(target, seconds, tally);
  return summarise(tally);
}

/**
 * Loads compared by their ratios, run in alternating slices (a, b, c, a, b, c, …) so that a change
 * in what else the machine is doing falls on all of them alike. With `meter`, its readings (e.g.
 * CPU seconds per process) are taken around every slice and their differences summed per target.
 * Each target first gets `warmupS` seconds of unrecorded load, so that freshly started processes
 * are compared once their code is compiled.
 */
export async function loadInterleaved(
  targets: Target[],
  seconds: number,
  slices = 4,
  meter?: () => Promise<Record<string, number>>,
  warmupS = 1,
): Promise<(LoadResult & { metered: Record<string, number> })[]> {
  for (const target of targets) await runSlice(target, warmupS, null);
  const tallies = targets.map(emptyTally);
  const metered = targets.map((): Record<string, number> => ({}));
  for (let i = 0; i < slices; i++) {
    for (const [j, target] of targets.entries()) {
      const before = meter ? await meter() : {};
      await runSlice(target, seconds / slices, tallies[j]!);
      if (!meter) continue;
      const after = await meter();
      for (const [key, value] of Object.entries(after))
        metered[j]![key] = (metered[j]![key] ?? 0) + value - (before[key] ?? 0);
    }
  }
  return tallies.map((tally, j) => ({ ...summarise(tally), metered: metered[j]! }));
}

/** A multipart/form-data body with a fixed boundary. */
export function multipartBody(fields: Record<string, string>): { body: string; contentType: string } {
  const boundary = "----emberwright-bench-7d1f3a";
  const parts = Object.entries(fields).map(
    ([name, value]) => `--${boundary}\r\nContent-Disposition: form-data; name="${name}"\r\n\r\n${value}\r\n`,
  );
  return { body: `${parts.join("")}--${boundary}--\r\n`, contentType: `multipart/form-data; boundary=${boundary}` };
}

/*
 * The soak: one production server started with `node --expose-gc` and the gc probe
 * (gc-probe.mjs), a steady mix of plan requests, page views and lead posts from autocannon for
 * SOAK_MINUTES (10 by default), and the server's memory after a full garbage collection once a
 * minute. The first reading (after one minute) is the warmed-up level; the last, taken while the
 * load still runs, is compared with it. Heap after gc tells retained objects (a leak) apart from a
 * heap V8 has merely grown and not yet given back; RSS after gc is what the machine pays.
 */
import { readFile } from "node:fs/promises";
import path from "node:path";
import autocannon, { type AutocannonOptions } from "autocannon";
import { multipartBody } from "./http-load";
import { startBenchServer, signIn } from "./server";

export type MemoryReading = { minute: number; rss: number; heapUsed: number; heapTotal: number; external: number };

export type SoakResult = {
  minutes: number;
  rate: number;
  readings: MemoryReading[];
  requests: number;
  statusCounts: Record<string, number>;
  errors: number;
  leadsPosted: number;
};

export const SOAK_RATE = 40;

export async function runSoak(
  root: string,
  minutes: number,
  planBody: (origin: string) => Promise<string>,
  owner: { email: string; password: string },
  company: string,
): Promise<SoakResult> {
  const dataName = "bench-soak";
  const gcFile = path.join(root, "data", dataName, "gc.jsonl");
  const server = await startBenchServer(root, {
    name: dataName,
    nodeArgs: ["--expose-gc", "--import", "./tests/bench/support/gc-probe.mjs"],
    env: { BENCH_GC_FILE: gcFile },
  });
  try {
    const { origin } = server;
    const cookie = await signIn(origin, owner.email, owner.password);
    const plan = await planBody(origin);
    let sequence = 0;
    let leadsPosted = 0;
    const lead = () =>
      multipartBody({
        customerName: "Soak Homeowner",
        email: `soak-${process.pid}-${++sequence}@example.test`,
        phone: "(970) 555-0131",
        street: "12 Quarry Lane",
        town: "Millbrook",
        buildWindow: "this-season",
        consent: "on",
        design: "units=14",
      });
    const json = { "Content-Type": "application/json", Origin: origin };
    // One round per connection, repeated: 4 plan requests, 3 page views, 1 lead post.
    const requests: NonNullable<AutocannonOptions["requests"]> = [
      { path: "/api/plan", method: "POST", headers: json, body: plan },
      { path: `/c/${company}`, method: "GET" },
      { path: "/api/plan", method: "POST", headers: json, body: plan },
      { path: "/", method: "GET" },
      { path: "/api/plan", method: "POST", headers: json, body: plan },
      { path: "/app/inbox", method: "GET", headers: { Cookie: cookie } },
      { path: "/api/plan", method: "POST", headers: json, body: plan },
      {
        path: `/c/${company}`,
        method: "POST",
        headers: { "Content-Type": lead().contentType, Origin: origin },
        setupRequest: (request: { body?: string }) => {
          leadsPosted += 1;
          return { ...request, body: lead().body };
        },
      },
    ];
    const statusCounts: Record<string, number> = {};
    const instance = autocannon({
      url: origin,
      connections: 4,
      overallRate: SOAK_RATE,
      duration: minutes * 60 + 5,
      timeout: 10,
      requests,
    });
    instance.on("response", (_client: unknown, statusCode: number) => {
      statusCounts[statusCode] = (statusCounts[statusCode] ?? 0) + 1;
    });
    const readings: MemoryReading[] = [];
    const started = Date.now();
    for (let minute = 1; minute <= minutes; minute++) {
      await new Promise((r) => setTimeout(r, started + minute * 60_000 - Date.now()));
      readings.push({ minute, ...(await readAfterGc(server.pid, gcFile)) });
      process.stderr.write(
        `bench: soak minute ${minute}: heap ${(readings.at(-1)!.heapUsed / 2 ** 20).toFixed(1)} MiB, RSS ${(readings.at(-1)!.rss / 2 ** 20).toFixed(1)} MiB after gc\n`,
      );
    }
    const result = await instance;
    return {
      minutes,
      rate: SOAK_RATE,
      readings,
      requests: Object.values(statusCounts).reduce((a, b) => a + b, 0),
      statusCounts,
      errors: result.errors,
      leadsPosted,
    };
  } finally {
    await server.stop();
  }
}

/** Asks the probe for a gc and a memory reading, and waits for its line in the file. */
async function readAfterGc(pid: number, file: string): Promise<Omit<MemoryReading, "minute">> {
  const linesBefore = await readLines(file);
  process.kill(pid, "SIGUSR2");
  const deadline = Date.now() + 15_000;
  while (Date.now() < deadline) {
    await new Promise((r) => setTimeout(r, 200));
    const lines = await readLines(file);
    if (lines.length > linesBefore.length) {
      const { rss, heapUsed, heapTotal, external } = JSON.parse(lines.at(-1)!) as MemoryReading;
      return { rss, heapUsed, heapTotal, external };
    }
  }
  throw new Error(
    "The soak server's gc probe did not answer within 15 s (was it started with --expose-gc and the probe?).",
  );
}

async function readLines(file: string): Promise<string[]> {
  try {
    return (await readFile(file, "utf8")).split("\n").filter(Boolean);
  } catch {
    return [];
  }
}

/*
 * Speed of the estimating engine alone: runs computePlan on a rotating set of realistic jobs for
 * about two seconds and prints plans per second and per-call percentiles as JSON.
 * Run: npx tsx tests/bench/plan-engine.bench.ts
 */
import { computePlan, type PlanInput, type PlanOptions } from "~/domain/plan";

const WALL_UNIT = { faceIn: 12, backIn: 8, depthIn: 8, heightIn: 4, priceCents: 650 };
const CAP = { lengthIn: 16, depthIn: 12, thicknessIn: 2.5, innerOverhangIn: 2, priceCents: 2200 };
const OPTIONS: PlanOptions = {
  supplyPrices: {
    aggregatePerTonCents: 4500,
    adhesivePerCartridgeCents: 900,
    beddingSandPerTonCents: 5000,
    jointSandPerBagCents: 3500,
  },
};

const JOBS: PlanInput[] = [
  {
    ring: { unitCount: 14 },
    wallUnit: WALL_UNIT,
    courses: 3,
    cap: CAP,
    liner: { kind: "steel-ring", outsideDiameterIn: 36, heightIn: 10, priceCents: 22000 },
  },
  {
    ring: { bowlDiameterIn: 40, fit: "at-least" },
    wallUnit: WALL_UNIT,
    courses: 4,
    cap: CAP,
    liner: { kind: "firebrick", lengthIn: 9, widthIn: 4.5, heightIn: 2.5, priceCents: 300 },
  },
  {
    ring: { bowlDiameterIn: 34, fit: "exact" },
    wallUnit: WALL_UNIT,
    courses: 3,
    cap: { ...CAP, outerOverhangIn: 1.5 },
  },
  {
    ring: { bowlDiameterIn: 44, fit: "nearest" },
    wallUnit: WALL_UNIT,
    courses: 4,
    cap: CAP,
    patio: {
      outsideRadiusIn: 120,
      border: { widthIn: 6, lengthIn: 12, priceCents: 400 },
      paver: { lengthIn: 8, widthIn: 4, priceCents: 90 },
    },
    site: { setbackFt: 20 },
  },
];

const BUDGET_MS = 2000;
const MAX_CALLS = 2_000_000;

// Warm up so the JIT has compiled the hot paths before timing.
for (let i = 0; i < 2000; i++) computePlan(JOBS[i % JOBS.length], OPTIONS);

const samplesNs: number[] = [];
let sink = 0;
const started = process.hrtime.bigint();
const deadline = started + BigInt(BUDGET_MS) * 1_000_000n;
let now = started;
while (now < deadline && samplesNs.length < MAX_CALLS) {
  const before = now;
  const plan = computePlan(JOBS[samplesNs.length % JOBS.length], OPTIONS);
  sink += plan.ring.unitCount;
  now = process.hrtime.bigint();
  samplesNs.push(Number(now - before));
}
const elapsedNs = Number(now - started);
samplesNs.sort((x, y) => x - y);
const percentileUs = (p: number) =>
  samplesNs[Math.min(samplesNs.length - 1, Math.floor((p / 100) * samplesNs.length))] / 1000;

console.log(
  JSON.stringify(
    {
      bench: "plan-engine",
      calls: samplesNs.length,
      plansPerSecond: Math.round(samplesNs.length / (elapsedNs / 1e9)),
      p50Us: Number(percentileUs(50).toFixed(1)),
      p99Us: Number(percentileUs(99).toFixed(1)),
      maxUs: Number((samplesNs[samplesNs.length - 1] / 1000).toFixed(1)),
      jobs: JOBS.length,
      checksum: sink,
    },
    null,
    2,
  ),
);

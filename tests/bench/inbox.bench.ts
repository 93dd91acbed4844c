/*
 * The inbox with 10,000 requests: fills a temporary database, then times the inbox's own loader
 * (session check, company, team, page of 25, counts per status, unseen count, seen-mark write)
 * for the first page and for filtered, searched, sorted and deep pages. Prints JSON with p50/p95 ms.
 * Budget: first page under 50 ms at p95. Bounded: at most ~8 s of timing per case.
 * Run: npx tsx tests/bench/inbox.bench.ts
 */
import { mkdirSync, rmSync } from "node:fs";
import { tmpdir } from "node:os";
import path from "node:path";
import { randomUUID } from "node:crypto";

const LEADS = 10_000;
const WARM_UP = 15;
const MAX_RUNS = 300;
const CASE_BUDGET_MS = 8_000;

const dir = path.join(tmpdir(), `emberwright-inbox-bench-${randomUUID()}`);
mkdirSync(dir, { recursive: true });
process.env.DATABASE_URL = `file:${path.join(dir, "bench.db")}`;
process.env.OUTBOX_WORKER = "off";
process.env.NODE_ENV = "test";

const { eq } = await import("drizzle-orm");
const { db } = await import("~/lib/platform/db.server");
const { leads, users, companies } = await import("~/db/schema");
const { startSession } = await import("~/lib/auth/session.server");
const { seedDemo } = await import("../../scripts/seed-demo");
const { loader } = await import("~/routes/app-inbox");

await seedDemo();
const [company] = await db.select().from(companies).where(eq(companies.slug, "cinder-slate"));
const staff = await db.select().from(users).where(eq(users.companyId, company!.id));
const estimator = staff.find((u) => u.role === "estimator")!;
const owner = staff.find((u) => u.role === "owner")!;
const [template] = await db.select().from(leads).where(eq(leads.companyId, company!.id)).limit(1);

// A seeded random sequence, so every run fills the same rows.
let seed = 20261202;
const random = () => (seed = (seed * 1_103_515_245 + 12_345) % 2 ** 31) / 2 ** 31;
const pick = <T>(items: readonly T[]) => items[Math.floor(random() * items.length)]!;
const FIRST = [
  "Ada",
  "Bram",
  "Cleo",
  "Dov",
  "Esme",
  "Fitz",
  "Greta",
  "Hugo",
  "Iris",
  "Jonah",
  "Kaia",
  "Lev",
  "Mira",
  "Nils",
  "Opal",
  "Pavel",
  "Quinn",
  "Rhea",
  "Soren",
  "Tova",
];
const LAST = [
  "Ashdown",
  "Brisco",
  "Calloway",
  "Drummond",
  "Everly",
  "Fairweather",
  "Galloway",
  "Hartwell",
  "Ingram",
  "Jessop",
  "Kettering",
  "Lockridge",
  "Marlow",
  "Northcott",
  "Oakhurst",
  "Penrose",
];
const TOWNS = [
  "Millbrook Falls",
  "Harrow Bend",
  "Quillan Park",
  "Stoneleigh",
  "Copperfield Mills",
  "Fernwick",
  "Ashby Cross",
  "Tallow Creek",
];
const STATUSES = [
  "request",
  "called-back",
  "consult-booked",
  "measured",
  "proposal-out",
  "signed",
  "on-hold",
  "not-going-ahead",
] as const;
const started = Date.now();
const now = Date.now();
for (let offset = 0; offset < LEADS; offset += 500) {
  const rows = Array.from({ length: Math.min(500, LEADS - offset) }, (_, k) => {
    const i = offset + k;
    const first = pick(FIRST);
    const last = pick(LAST);
    const status = pick(STATUSES);
    const low = random() < 0.05 ? null : 120_000 + Math.floor(random() * 400) * 1000;
    return {
      companyId: company!.id,
      ref: `bench-${i}`,
      status,
      stopReason: status === "not-going-ahead" || status === "on-hold" ? "Budget." : null,
      pausedStage: status === "not-going-ahead" || status === "on-hold" ? ("called-back" as const) : null,
      assignedUserId: random() < 0.4 ? estimator.id : random() < 0.5 ? owner.id : null,
      customerName: `${first} ${last}`,
      email: `${first}.${last}.${i}@example.test`.toLowerCase(),
      phone: `(555) 01${i % 10}-${String(1000 + (i % 9000)).padStart(4, "0")}`,
      street: `${1 + (i % 900)} ${pick(LAST)} Road`,
      town: pick(TOWNS),
      buildWindow: "not-sure" as const,
      designJson: template!.designJson,
      planJson: template!.planJson,
      stoneName: template!.stoneName,
      bowlDiameterIn: 30 + random() * 24,
      priceLowCents: low,
      priceHighCents: low === null ? null : low + 30_000,
      // Two years of requests.
      createdAt: new Date(now - Math.floor(random() * 730 * 86_400_000)).toISOString(),
    };
  });
  await db.insert(leads).values(rows);
}
const fillSeconds = (Date.now() - started) / 1000;
const cookie = (await startSession(estimator.id)).split(";")[0]!;

function percentile(sorted: number[], p: number): number {
  return sorted[Math.min(sorted.length - 1, Math.floor((p / 100) * sorted.length))]!;
}

async function time(query: string) {
  const url = `http://localhost/app/inbox${query}`;
  const call = async () => {
    const result = (await loader({
      request: new Request(url, { headers: { Cookie: cookie } }),
      params: {},
      context: {},
    } as never)) as { inbox: { rows: unknown[] } | null };
    if (!result.inbox) throw new Error(`the inbox refused ${query}`);
    return result.inbox.rows.length;
  };
  for (let i = 0; i < WARM_UP; i++) await call();
  const samples: number[] = [];
  const deadline = Date.now() + CASE_BUDGET_MS;
  let rows = 0;
  while (samples.length < MAX_RUNS && Date.now() < deadline) {
    const t0 = performance.now();
    rows = await call();
    samples.push(performance.now() - t0);
  }
  samples.sort((a, b) => a - b);
  const round = (n: number) => Math.round(n * 100) / 100;
  return { p50: round(percentile(samples, 50)), p95: round(percentile(samples, 95)), runs: samples.length, rows };
}

const first = await time("");
const filtered = await time(`?status=proposal-out&assignee=${estimator.id}`);
const dated = await time("?from=2026-01-01&to=2026-06-30&sort=price&dir=desc");
const searched = await time("?q=hartwell");
const deep = await time("?page=300");
const sortedByName = await time("?sort=customer&dir=asc");

console.log(
  JSON.stringify(
    {
      bench: "inbox",
      leads: LEADS,
      firstPageP95Ms: first.p95,
      firstPageP50Ms: first.p50,
      filteredPageP95Ms: filtered.p95,
      filteredPageP50Ms: filtered.p50,
      dateRangeByPriceP95Ms: dated.p95,
      searchP95Ms: searched.p95,
      page300P95Ms: deep.p95,
      sortedByNameP95Ms: sortedByName.p95,
      runsPerCase: first.runs,
      rowsOnFilteredPage: filtered.rows,
      fillSeconds: Math.round(fillSeconds * 10) / 10,
      note: "the inbox route's loader called directly: session, company, team, page, counts, unseen count and the seen-mark write",
    },
    null,
    2,
  ),
);
rmSync(dir, { recursive: true, force: true });
process.exit(0);

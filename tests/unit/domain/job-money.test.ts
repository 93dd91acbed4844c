import { expect, test } from "vitest";
import { balanceDue, contractOf, jobCost, monthlyReport, orderedMaterialCents } from "~/domain/job-money";

// A finished job's money in integer cents, every figure worked by hand in the comments. That the
// balance due on completion is the contract price (with signed change orders) less the deposit
// already paid is how progress billing on a fixed-price job works (common practice, no source).

test("balance: $4,850 price + $640 add-on = $5,490 signed; + $380 change order = $5,870; − $1,647 deposit = $4,223 due", () => {
  const balance = balanceDue({
    proposalPriceCents: 485_000,
    proposalTotalCents: 549_000,
    changeOrderDeltasCents: [38_000],
    depositPaidCents: 164_700,
  });
  expect(balance).toEqual({
    proposalPriceCents: 485_000,
    addOnsCents: 64_000,
    changeOrdersCents: 38_000,
    depositCents: 164_700,
    contractCents: 587_000,
    amountCents: 422_300,
  });
  expect(contractOf(balance)).toBe(587_000);
});

test("balance: a credit change order lowers it: $2,200 + $0 add-ons + $250 − $400.50 = $2,049.50; − $660 deposit = $1,389.50", () => {
  const balance = balanceDue({
    proposalPriceCents: 220_000,
    proposalTotalCents: 220_000,
    changeOrderDeltasCents: [25_000, -40_050],
    depositPaidCents: 66_000,
  });
  expect(balance.changeOrdersCents).toBe(-15_050);
  expect(balance.contractCents).toBe(204_950);
  expect(balance.amountCents).toBe(138_950);
});

test("balance: a credit larger than what is left comes out negative (owed back): $1,000 − $700 credit − $300.01 deposit = −$0.01", () => {
  expect(
    balanceDue({
      proposalPriceCents: 100_000,
      proposalTotalCents: 100_000,
      changeOrderDeltasCents: [-70_000],
      depositPaidCents: 30_001,
    }).amountCents,
  ).toBe(-1);
});

test("balance: fractions of a cent, a total below the price and a negative deposit are refused", () => {
  const base = {
    proposalPriceCents: 100_000,
    proposalTotalCents: 100_000,
    changeOrderDeltasCents: [],
    depositPaidCents: 0,
  };
  expect(() => balanceDue({ ...base, depositPaidCents: 10.5 })).toThrow(RangeError);
  expect(() => balanceDue({ ...base, changeOrderDeltasCents: [0.1] })).toThrow(RangeError);
  expect(() => balanceDue({ ...base, proposalTotalCents: 99_999 })).toThrow(/less than its price/);
  expect(() => balanceDue({ ...base, depositPaidCents: -1 })).toThrow(/negative/);
});

test("material as ordered: a whole pallet of 72 units at $6.25 = $450; 2 t of base at $38.40 = $76.80; an unpriced line is named", () => {
  const result = orderedMaterialCents(
    [
      { item: "Ridgeback Taper", suppliedQuantity: 72 },
      { item: "Crushed base", suppliedQuantity: 2 },
      { item: "Mystery sealer", suppliedQuantity: 1 },
    ],
    [
      { item: "Ridgeback Taper", unitPriceCents: 625 },
      { item: "Crushed base", unitPriceCents: 3_840 },
    ],
  );
  // 72 × 625 = 45,000; 2 × 3,840 = 7,680; 45,000 + 7,680 = 52,680.
  expect(result).toEqual({ cents: 52_680, unpriced: ["Mystery sealer"] });
  // 1.35 t × $38.40 = $51.84 exactly; 0.333 × 100 = 33.3 → 33 (rounded to the cent per line).
  expect(
    orderedMaterialCents(
      [
        { item: "a", suppliedQuantity: 1.35 },
        { item: "b", suppliedQuantity: 0.333 },
      ],
      [
        { item: "a", unitPriceCents: 3_840 },
        { item: "b", unitPriceCents: 100 },
      ],
    ).cents,
  ).toBe(5_217);
});

test("job cost: 12 h planned at $48/h = $576 + $1,100 material = $1,676 estimated; 14.5 h = $696 + $1,180 ordered + $42 extras = $1,918 actual", () => {
  const cost = jobCost({
    plannedHours: 12,
    labourCostRateCents: 4_800,
    plannedMaterialCents: 110_000,
    workedHours: 14.5,
    orderedMaterialCents: 118_000,
    extrasCents: 4_200,
    revenueCents: 330_000,
  });
  expect(cost.estimated).toEqual({
    labourHours: 12,
    labourCents: 57_600,
    materialCents: 110_000,
    extrasCents: 0,
    totalCents: 167_600,
  });
  // 14.5 × 4,800 = 69,600; 69,600 + 118,000 + 4,200 = 191,800.
  expect(cost.actual.totalCents).toBe(191_800);
  // 191,800 − 167,600 = 24,200 over; $3,300 − $1,918 = $1,382 gross profit; 1,918 ÷ 1,676 = 1.1444…
  expect(cost.differenceCents).toBe(24_200);
  expect(cost.grossProfitCents).toBe(138_200);
  expect(cost.accuracy).toBeCloseTo(1.14439, 4);
});

test("job cost: with no supplier order the plan's material counts as ordered; no estimate gives no accuracy", () => {
  const cost = jobCost({
    plannedHours: 10,
    labourCostRateCents: 5_000,
    plannedMaterialCents: 90_000,
    workedHours: 9.25,
    orderedMaterialCents: null,
    extrasCents: 0,
    revenueCents: 220_000,
  });
  // 9.25 × 5,000 = 46,250; + 90,000 = 136,250 against 50,000 + 90,000 = 140,000: 3,750 under.
  expect(cost.actual.materialCents).toBe(90_000);
  expect(cost.differenceCents).toBe(-3_750);
  expect(
    jobCost({
      plannedHours: 0,
      labourCostRateCents: 5_000,
      plannedMaterialCents: 0,
      workedHours: 1,
      orderedMaterialCents: null,
      extrasCents: 0,
      revenueCents: 0,
    }).accuracy,
  ).toBeNull();
  expect(() =>
    jobCost({
      plannedHours: -1,
      labourCostRateCents: 5_000,
      plannedMaterialCents: 0,
      workedHours: 1,
      orderedMaterialCents: null,
      extrasCents: 0,
      revenueCents: 0,
    }),
  ).toThrow(/planned hours/);
});

test("monthly report: jobs summed by month, oldest first, accuracy a ratio of the sums", () => {
  const rows = monthlyReport([
    { month: "2026-11", revenueCents: 330_000, estimatedCents: 167_600, actualCents: 191_800 },
    { month: "2026-10", revenueCents: 220_000, estimatedCents: 140_000, actualCents: 136_250 },
    { month: "2026-11", revenueCents: 260_000, estimatedCents: 150_000, actualCents: 147_000 },
  ]);
  expect(rows.map((r) => r.month)).toEqual(["2026-10", "2026-11"]);
  // October: one job; $2,200 − $1,362.50 = $837.50; 136,250 ÷ 140,000 = 0.97321…
  expect(rows[0]).toMatchObject({ jobsBuilt: 1, revenueCents: 220_000, grossProfitCents: 83_750 });
  expect(rows[0]!.accuracy).toBeCloseTo(0.97321, 4);
  // November: 330,000 + 260,000 = 590,000 revenue; 191,800 + 147,000 = 338,800 actual;
  // 590,000 − 338,800 = 251,200 profit; 338,800 ÷ (167,600 + 150,000 = 317,600) = 1.06675…
  expect(rows[1]).toMatchObject({
    jobsBuilt: 2,
    revenueCents: 590_000,
    actualCents: 338_800,
    estimatedCents: 317_600,
    grossProfitCents: 251_200,
  });
  expect(rows[1]!.accuracy).toBeCloseTo(1.06675, 4);
  expect(monthlyReport([])).toEqual([]);
  expect(() => monthlyReport([{ month: "2026-13", revenueCents: 0, estimatedCents: 0, actualCents: 0 }])).toThrow(
    /not a month/,
  );
});

test("each refusal names the figure that is not whole cents; a deposit of 0 is allowed", () => {
  const balance = {
    proposalPriceCents: 300_000,
    proposalTotalCents: 320_000,
    changeOrderDeltasCents: [],
    depositPaidCents: 0,
  };
  // No deposit taken: the whole contract is due on completion.
  expect(balanceDue(balance).amountCents).toBe(320_000);
  expect(() => balanceDue({ ...balance, proposalPriceCents: 0.5 })).toThrow(
    new RangeError("proposal price must be whole cents, got 0.5"),
  );
  expect(() => balanceDue({ ...balance, proposalTotalCents: 1.5 })).toThrow(/^proposal total must be whole cents/);
  expect(() => balanceDue({ ...balance, depositPaidCents: 2.5 })).toThrow(/^deposit must be whole cents/);
  expect(() => balanceDue({ ...balance, changeOrderDeltasCents: [10, 0.25] })).toThrow(
    /^change order must be whole cents, got 0.25/,
  );
  const cost = {
    plannedHours: 10,
    labourCostRateCents: 4_800,
    plannedMaterialCents: 100_000,
    workedHours: 10,
    orderedMaterialCents: null,
    extrasCents: 0,
    revenueCents: 300_000,
  };
  expect(() => jobCost({ ...cost, labourCostRateCents: 48.5 })).toThrow(/^labour cost rate must be whole cents/);
  expect(() => jobCost({ ...cost, plannedMaterialCents: 0.1 })).toThrow(/^planned material must be whole cents/);
  expect(() => jobCost({ ...cost, extrasCents: 0.1 })).toThrow(/^extras must be whole cents/);
  expect(() => jobCost({ ...cost, revenueCents: 0.1 })).toThrow(/^revenue must be whole cents/);
});

test("a month is exactly YYYY-MM (ISO 8601): nothing before or after it, months 01–12; a month with no estimate has no accuracy", () => {
  const job = { revenueCents: 100, estimatedCents: 80, actualCents: 90 };
  for (const month of ["x2026-12", "2026-12-01", "2026-00", "2026-13"]) {
    expect(() => monthlyReport([{ ...job, month }])).toThrow(new RangeError(`not a month: ${month}`));
  }
  expect(monthlyReport([{ ...job, month: "2026-09" }])[0]!.accuracy).toBeCloseTo(90 / 80, 12);
  expect(monthlyReport([{ ...job, month: "2026-09", estimatedCents: 0 }])[0]!.accuracy).toBeNull();
});

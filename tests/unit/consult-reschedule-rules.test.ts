import { expect, test } from "vitest";
import { checkReschedule, groupSlotsByDay, HOMEOWNER_CHANGE_CUTOFF_HOURS } from "~/lib/consults/consult-slots";

const now = new Date("2026-12-02T15:00:00Z");
const booked = "2026-12-07T15:00:00.000Z";
const free = [
  { startsAt: "2026-12-07T17:00:00.000Z", endsAt: "2026-12-07T18:00:00.000Z" },
  { startsAt: "2026-12-08T15:00:00.000Z", endsAt: "2026-12-08T16:00:00.000Z" },
];
const base = {
  status: "confirmed",
  currentStartsAt: booked,
  freeSlots: free,
  by: "homeowner" as const,
  companyName: "Cinder & Slate",
  now,
};

test("a paid consult moves to a free time, and the slot it moves to is the offered one (its end included)", () => {
  expect(checkReschedule({ ...base, targetStartsAt: "2026-12-08T15:00:00.000Z" })).toEqual({ ok: true, slot: free[1] });
  // The same instant written with an offset is the same time.
  expect(checkReschedule({ ...base, targetStartsAt: "2026-12-08T09:00:00-06:00" })).toEqual({
    ok: true,
    slot: free[1],
  });
});

test("only a confirmed booking moves: a hold still being paid or a cancelled one is refused with 409", () => {
  for (const status of ["held", "cancelled", "expired"]) {
    expect(checkReschedule({ ...base, status, targetStartsAt: free[0]!.startsAt })).toMatchObject({
      ok: false,
      status: 409,
    });
  }
});

test("a time that is not free (taken, blocked, outside hours) is refused with 409, the booked time itself with 400", () => {
  expect(checkReschedule({ ...base, targetStartsAt: "2026-12-09T15:00:00.000Z" })).toMatchObject({
    ok: false,
    status: 409,
    message: expect.stringContaining("no longer free"),
  });
  expect(checkReschedule({ ...base, targetStartsAt: booked })).toMatchObject({ ok: false, status: 400 });
  expect(checkReschedule({ ...base, targetStartsAt: "next tuesday" })).toMatchObject({ ok: false, status: 400 });
});

test("the homeowner may move it online until 24 hours before, the same cutoff as cancelling; staff any time", () => {
  expect(HOMEOWNER_CHANGE_CUTOFF_HOURS).toBe(24);
  const justInside = new Date(new Date(booked).getTime() - 24 * 3_600_000);
  const tooLate = new Date(justInside.getTime() + 1);
  expect(checkReschedule({ ...base, now: justInside, targetStartsAt: free[1]!.startsAt }).ok).toBe(true);
  expect(checkReschedule({ ...base, now: tooLate, targetStartsAt: free[1]!.startsAt })).toMatchObject({
    ok: false,
    status: 409,
    message: expect.stringContaining("call Cinder & Slate"),
  });
  expect(checkReschedule({ ...base, by: "staff", now: tooLate, targetStartsAt: free[1]!.startsAt }).ok).toBe(true);
});

test("slots group by the company's local day: 11 PM in Chicago is still that day, though it is the next day in UTC", () => {
  // America/Chicago is UTC−6 in December (IANA tz database).
  const late = { startsAt: "2026-12-08T05:00:00.000Z", endsAt: "2026-12-08T06:00:00.000Z" };
  const groups = groupSlotsByDay([free[1]!, late, free[0]!], "America/Chicago");
  expect(groups.map((g) => [g.day, g.slots.length])).toEqual([
    ["2026-12-07", 2],
    ["2026-12-08", 1],
  ]);
  expect(groups[0]!.slots.map((s) => s.startsAt)).toEqual([free[0]!.startsAt, late.startsAt]);
});

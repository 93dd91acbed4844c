import { existsSync, readFileSync } from "node:fs";
import { expect, test } from "vitest";
import { companySettingsSchema } from "~/lib/settings/company-schema";
import {
  currentTimeZones,
  describeLocalTime,
  describePlace,
  groupTimeZones,
  RENAMED_TIME_ZONES,
} from "~/lib/settings/time-zones";

// The IANA time zone database as Debian's tzdata ships it: zone.tab lists every current zone name.
const ZONE_TAB = "/usr/share/zoneinfo/zone.tab";

test.skipIf(!existsSync(ZONE_TAB))(
  "every zone offered is a current IANA name (zone.tab, IANA tz database), none retired",
  () => {
    const current = new Set(
      readFileSync(ZONE_TAB, "utf8")
        .split("\n")
        .filter((line) => line && !line.startsWith("#"))
        .map((line) => line.split("\t")[2]),
    );
    const offered = currentTimeZones();
    expect(offered.filter((id) => !current.has(id))).toEqual([]);
    for (const old of Object.keys(RENAMED_TIME_ZONES)) expect(offered).not.toContain(old);
    expect(offered).toContain("Europe/Kyiv");
    expect(offered).toContain("Asia/Kolkata");
  },
);

test("a renamed zone and its new name keep the same clock (same UTC offset in January and July 2026)", () => {
  for (const [old, current] of Object.entries(RENAMED_TIME_ZONES)) {
    for (const instant of [new Date("2026-01-15T12:00:00Z"), new Date("2026-07-15T12:00:00Z")]) {
      expect(describeLocalTime(current, instant), `${old} → ${current}`).toBe(describeLocalTime(old, instant));
    }
  }
});

test("each zone shows its local time: noon UTC on 15 January is 6:00 AM in Chicago (US Central Standard Time is UTC−6, 15 U.S.C. §261)", () => {
  expect(describeLocalTime("America/Chicago", new Date("2026-01-15T12:00:00Z"))).toBe("6:00 AM, GMT-6");
  // India Standard Time is UTC+5:30 all year (no daylight saving time).
  expect(describeLocalTime("Asia/Kolkata", new Date("2026-07-15T12:00:00Z"))).toBe("5:30 PM, GMT+5:30");
});

test("zones are grouped by region, the Americas first, each named by its place", () => {
  const groups = groupTimeZones(new Date("2026-01-15T12:00:00Z"));
  expect(groups[0]!.region).toBe("Americas");
  const americas = groups[0]!.zones;
  expect(americas.find((z) => z.id === "America/Chicago")?.label).toBe("Chicago (6:00 AM, GMT-6)");
  expect(describePlace("America/Argentina/Buenos_Aires")).toBe("Buenos Aires, Argentina");
  // Every zone appears once, in one group.
  const all = groups.flatMap((g) => g.zones.map((z) => z.id));
  expect(new Set(all).size).toBe(all.length);
  expect(all.length).toBe(currentTimeZones().length);
});

const SETTINGS = {
  name: "Ridge Masonry",
  email: "office@example.com",
  phone: "",
  town: "Springfield",
  consultFee: "75",
  timeZone: "America/Chicago",
};

test("an old zone name posted to the settings is stored under its current name; an unknown one is refused", () => {
  expect(companySettingsSchema.parse({ ...SETTINGS, timeZone: "Europe/Kiev" }).timeZone).toBe("Europe/Kyiv");
  const refused = companySettingsSchema.safeParse({ ...SETTINGS, timeZone: "Mars/Olympus_Mons" });
  expect(refused.success).toBe(false);
  expect(refused.error?.issues[0]?.message).toBe("Choose a time zone from the list.");
});

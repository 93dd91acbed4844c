/*
 * Time zones for the office's settings. The runtime's list (Intl.supportedValuesOf, from ICU/CLDR)
 * still carries some names the IANA time zone database has since renamed (Asia/Calcutta for
 * Asia/Kolkata, Europe/Kiev for Europe/Kyiv): those are shown and stored under today's name. The
 * pairs are the IANA database's own (file `backward`; zone.tab lists the current names).
 */

/** Names the IANA database has renamed, old → current. */
export const RENAMED_TIME_ZONES: Readonly<Record<string, string>> = {
  "Africa/Asmera": "Africa/Asmara",
  "America/Buenos_Aires": "America/Argentina/Buenos_Aires",
  "America/Catamarca": "America/Argentina/Catamarca",
  "America/Coral_Harbour": "America/Atikokan",
  "America/Cordoba": "America/Argentina/Cordoba",
  "America/Godthab": "America/Nuuk",
  "America/Indianapolis": "America/Indiana/Indianapolis",
  "America/Jujuy": "America/Argentina/Jujuy",
  "America/Louisville": "America/Kentucky/Louisville",
  "America/Mendoza": "America/Argentina/Mendoza",
  "Asia/Calcutta": "Asia/Kolkata",
  "Asia/Katmandu": "Asia/Kathmandu",
  "Asia/Rangoon": "Asia/Yangon",
  "Asia/Saigon": "Asia/Ho_Chi_Minh",
  "Atlantic/Faeroe": "Atlantic/Faroe",
  "Europe/Kiev": "Europe/Kyiv",
  "Pacific/Enderbury": "Pacific/Kanton",
  "Pacific/Ponape": "Pacific/Pohnpei",
  "Pacific/Truk": "Pacific/Chuuk",
};

/** A zone's current IANA name (a renamed one's new name; any other unchanged). */
export function currentTimeZoneName(id: string): string {
  return RENAMED_TIME_ZONES[id] ?? id;
}

let cachedZones: string[] | null = null;

/** Every current zone this runtime knows, by its current name, sorted. */
export function currentTimeZones(): string[] {
  cachedZones ??= [...new Set(Intl.supportedValuesOf("timeZone").map(currentTimeZoneName))].sort();
  return cachedZones;
}

/** True for a zone name offered in the list (current names only). */
export function isOfferedTimeZone(id: string): boolean {
  return currentTimeZones().includes(id);
}

const REGION_NAMES: Record<string, string> = {
  America: "Americas",
  Europe: "Europe",
  Africa: "Africa",
  Asia: "Asia",
  Australia: "Australia",
  Pacific: "Pacific Ocean",
  Atlantic: "Atlantic Ocean",
  Indian: "Indian Ocean",
  Antarctica: "Antarctica",
  Arctic: "Arctic",
};
// The product's customers are mostly in the Americas: that group comes first, the rest in this order.
const REGION_ORDER = Object.keys(REGION_NAMES);

export type TimeZoneOption = { id: string; place: string; label: string; search: string };
export type TimeZoneGroup = { region: string; zones: TimeZoneOption[] };

const formatters = new Map<string, Intl.DateTimeFormat>();

/** The local time in a zone, e.g. "4:21 AM, GMT-6" (formatters are made once per zone). */
export function describeLocalTime(id: string, now: Date): string {
  let formatter = formatters.get(id);
  if (!formatter) {
    formatter = new Intl.DateTimeFormat("en-US", {
      timeZone: id,
      hour: "numeric",
      minute: "2-digit",
      timeZoneName: "shortOffset",
    });
    formatters.set(id, formatter);
  }
  const parts = formatter.formatToParts(now);
  // ICU writes a narrow no-break space before AM/PM; a plain space reads (and searches) the same everywhere.
  const time = parts
    .filter((p) => p.type !== "timeZoneName")
    .map((p) => p.value)
    .join("")
    .replace(/\s/g, " ")
    .trim();
  const offset = parts.find((p) => p.type === "timeZoneName")?.value ?? "";
  return offset ? `${time}, ${offset}` : time;
}

/** "America/Argentina/Buenos_Aires" → "Buenos Aires, Argentina"; "Europe/Kyiv" → "Kyiv". */
export function describePlace(id: string): string {
  const [, ...rest] = id.split("/");
  return (
    rest
      .reverse()
      .map((part) => part.replaceAll("_", " "))
      .join(", ") || id
  );
}

/** The current zones grouped by region, each with its place and its local time at `now`. */
export function groupTimeZones(now: Date): TimeZoneGroup[] {
  const groups = new Map<string, TimeZoneOption[]>();
  for (const id of currentTimeZones()) {
    const regionKey = id.includes("/") ? id.split("/")[0]! : "Other";
    const region = REGION_NAMES[regionKey] ?? regionKey;
    const place = describePlace(id);
    const option = {
      id,
      place,
      label: `${place} (${describeLocalTime(id, now)})`,
      search: `${place} ${region} ${id}`.toLowerCase(),
    };
    groups.set(region, [...(groups.get(region) ?? []), option]);
  }
  const rank = (region: string) => {
    const i = REGION_ORDER.findIndex((key) => REGION_NAMES[key] === region);
    return i === -1 ? REGION_ORDER.length : i;
  };
  return [...groups.entries()]
    .map(([region, zones]) => ({ region, zones: zones.sort((a, b) => a.place.localeCompare(b.place, "en")) }))
    .sort((a, b) => rank(a.region) - rank(b.region) || a.region.localeCompare(b.region, "en"));
}

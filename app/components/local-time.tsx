import { useBrowserValue } from "~/components/use-browser-value";

const format = (iso: string, timeZone: string) =>
  new Intl.DateTimeFormat("en-US", {
    timeZone,
    weekday: "short",
    month: "short",
    day: "numeric",
    hour: "numeric",
    minute: "2-digit",
    timeZoneName: "short",
  }).format(new Date(iso));

const readTimeZone = () => Intl.DateTimeFormat().resolvedOptions().timeZone;

/** A time in the company's zone, plus the reader's own zone once known in the browser, when it differs. */
export function LocalTime({ iso, companyTimeZone }: { iso: string; companyTimeZone: string }) {
  const viewerZone = useBrowserValue<string | null>(readTimeZone, null);
  const companyText = format(iso, companyTimeZone);
  const viewerText = viewerZone && viewerZone !== companyTimeZone ? format(iso, viewerZone) : null;
  return (
    <time dateTime={iso}>
      {companyText}
      {viewerText && viewerText !== companyText ? (
        <span className="text-char-500"> (your time: {viewerText})</span>
      ) : null}
    </time>
  );
}

/** The browser's time zone into a hidden field, so e-mails can name the homeowner's local time. */
export function TimeZoneField() {
  const zone = useBrowserValue(readTimeZone, "");
  return <input type="hidden" name="timeZone" value={zone} />;
}

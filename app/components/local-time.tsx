import { useEffect, useState } from "react";

const format = (iso: string, timeZone: string) =>
  new Intl.DateTimeFormat("en-US", { timeZone, weekday: "short", month: "short", day: "numeric", hour: "numeric", minute: "2-digit", timeZoneName: "short" }).format(new Date(iso));

/** A time in the company's zone, plus the reader's own zone once known in the browser, when it differs. */
export function LocalTime({ iso, companyTimeZone }: { iso: string; companyTimeZone: string }) {
  const [viewerZone, setViewerZone] = useState<string | null>(null);
  useEffect(() => setViewerZone(Intl.DateTimeFormat().resolvedOptions().timeZone), []);
  const companyText = format(iso, companyTimeZone);
  const viewerText = viewerZone && viewerZone !== companyTimeZone ? format(iso, viewerZone) : null;
  return (
    <time dateTime={iso}>
      {companyText}
      {viewerText && viewerText !== companyText ? <span className="text-char-500"> (your time: {viewerText})</span> : null}
    </time>
  );
}

/** The browser's time zone into a hidden field, so e-mails can name the homeowner's local time. */
export function TimeZoneField() {
  const [zone, setZone] = useState("");
  useEffect(() => setZone(Intl.DateTimeFormat().resolvedOptions().timeZone), []);
  return <input type="hidden" name="timeZone" value={zone} />;
}

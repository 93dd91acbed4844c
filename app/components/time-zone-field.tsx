import { useId, useMemo, useState } from "react";
import type { TimeZoneGroup } from "~/lib/settings/time-zones";

/**
 * The time zone choice: a native select grouped by region (each zone with its local time), with a
 * filter above it that narrows the list as you type a city, region or zone name. The chosen zone
 * stays in the list whatever the filter, so filtering never changes the value by itself.
 */
export function TimeZoneField({
  groups,
  defaultValue,
  error,
}: {
  groups: TimeZoneGroup[];
  defaultValue: string;
  error?: string;
}) {
  const id = useId();
  const [query, setQuery] = useState("");
  const [value, setValue] = useState(defaultValue);
  const needle = query.trim().toLowerCase();
  const shown = useMemo(
    () =>
      groups
        .map((group) => ({
          ...group,
          zones: group.zones.filter((zone) => zone.id === value || !needle || zone.search.includes(needle)),
        }))
        .filter((group) => group.zones.length > 0),
    [groups, needle, value],
  );
  const matches = shown.reduce(
    (sum, group) => sum + group.zones.filter((zone) => !needle || zone.search.includes(needle)).length,
    0,
  );
  const total = groups.reduce((sum, group) => sum + group.zones.length, 0);
  const chosen = groups.flatMap((group) => group.zones).find((zone) => zone.id === value);
  return (
    <div className="flex flex-col gap-2 sm:col-span-2">
      <div>
        <label htmlFor={`${id}-filter`} className="field-label">
          Find a time zone
        </label>
        <input
          id={`${id}-filter`}
          type="search"
          value={query}
          onChange={(e) => setQuery(e.target.value)}
          // Enter in the filter narrows the list; it must not save the whole settings form.
          onKeyDown={(e) => {
            if (e.key === "Enter") e.preventDefault();
          }}
          aria-describedby={`${id}-count`}
          aria-controls={`${id}-select`}
          placeholder="City or region, e.g. Chicago"
          autoComplete="off"
          className="field-input"
        />
        <p id={`${id}-count`} className="field-hint" aria-live="polite">
          {needle
            ? `${matches} of ${total} zones match “${query.trim()}”.`
            : `${total} zones, grouped by region, each with its local time now.`}
        </p>
      </div>
      <div>
        <label htmlFor={`${id}-select`} className="field-label">
          Time zone
        </label>
        <select
          id={`${id}-select`}
          name="timeZone"
          value={value}
          onChange={(e) => setValue(e.target.value)}
          aria-invalid={error ? true : undefined}
          aria-describedby={`${id}-chosen${error ? ` ${id}-error` : ""}`}
          className="field-input"
        >
          {chosen ? null : <option value={value}>{value}</option>}
          {shown.map((group) => (
            <optgroup key={group.region} label={group.region}>
              {group.zones.map((zone) => (
                <option key={zone.id} value={zone.id}>
                  {zone.label}
                </option>
              ))}
            </optgroup>
          ))}
        </select>
        <p id={`${id}-chosen`} className="field-hint">
          Consult times, e-mails and the schedule use this zone{chosen ? `: ${chosen.id}` : ""}.
        </p>
        {error ? (
          <p id={`${id}-error`} className="field-error">
            {error}
          </p>
        ) : null}
      </div>
    </div>
  );
}
